import { AppError } from "../errors";

/** 413: an upload larger than the limit; nothing of it is kept. */
export class FileTooLargeError extends AppError {
  readonly maxBytes: number;
  constructor(maxBytes: number) {
    const mb = maxBytes / (1024 * 1024);
    super("file_too_large", 413, `The file is larger than ${mb} MB (${new Intl.NumberFormat("en-GB").format(maxBytes)} bytes). Split the log into smaller files and upload them one by one.`);
    this.maxBytes = maxBytes;
  }
}
