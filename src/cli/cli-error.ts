/** A bad-input error: the CLI prints its message on one line and exits non-zero, without a stack. */
export class CliError extends Error {
  constructor(message: string, readonly exitCode = 2) {
    super(message);
    this.name = "CliError";
  }
}
