/** A backup that cannot be made, or a backup folder that cannot be restored; the message says why and what to do. */
export class BackupError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "BackupError";
  }
}
