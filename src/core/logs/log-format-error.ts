/** A log that cannot be read at all (empty, no header, no total-field column, bad mapping). */
export class LogFormatError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "LogFormatError";
  }
}
