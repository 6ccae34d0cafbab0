/** Errors raised by the reference-field core. Each carries enough context for a one-line message. */

/** A coefficient table that does not follow the IAGA layout; `lineNumber` is 1-based. */
export class CoefficientTableError extends Error {
  constructor(
    message: string,
    readonly lineNumber: number,
  ) {
    super(`line ${lineNumber}: ${message}`);
    this.name = "CoefficientTableError";
  }
}

/** A date outside the span a model is defined for; models are never extrapolated. */
export class OutsideModelValidityError extends Error {
  constructor(
    readonly modelName: string,
    readonly decimalYear: number,
    readonly validFromYear: number,
    readonly validToYear: number,
  ) {
    super(
      `date ${decimalYear.toFixed(4)} is outside the validity of ${modelName} ` +
        `(${validFromYear.toFixed(1)} to ${validToYear.toFixed(1)})`,
    );
    this.name = "OutsideModelValidityError";
  }
}

/** A WMM coefficient document that does not have the expected shape. */
export class ModelFormatError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "ModelFormatError";
  }
}
