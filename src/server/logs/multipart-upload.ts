import "server-only";
/**
 * Reads a multipart/form-data log upload as a stream: the `file` part goes straight to a staged
 * temp file (hashed, size-limited), the other parts become string fields. Nothing is buffered
 * whole in memory; the request is refused early when Content-Length already exceeds the limit.
 */
import busboy from "busboy";
import { Readable } from "node:stream";
import type { ReadableStream as WebReadableStream } from "node:stream/web";
import { ValidationError } from "../errors";
import { FileTooLargeError } from "../storage/errors";
import { discardStaged, MAX_UPLOAD_BYTES, stageUpload, type StagedFile } from "../storage/original-files";

/** Room for the other form fields and multipart framing around the file. */
const ENVELOPE_BYTES = 1024 * 1024;
const MAX_FIELDS = 40;
const MAX_FIELD_BYTES = 16 * 1024;
const INTERRUPTED = "The upload was interrupted before the file arrived whole. Nothing was kept; please upload it again.";

export interface LogUpload {
  /** Form fields as strings, plus `fileName` from the file part. */
  fields: Record<string, string>;
  staged: StagedFile;
}

export async function readLogUpload(request: Request): Promise<LogUpload> {
  const contentType = request.headers.get("content-type") ?? "";
  if (!/^multipart\/form-data/i.test(contentType)) {
    throw new ValidationError({ file: ["Send the log as multipart/form-data with a `file` part."] });
  }
  const length = Number(request.headers.get("content-length") ?? NaN);
  if (Number.isFinite(length) && length > MAX_UPLOAD_BYTES + ENVELOPE_BYTES) throw new FileTooLargeError(MAX_UPLOAD_BYTES);
  if (!request.body) throw new ValidationError({ file: ["Attach the log file."] });

  const parser = busboy({
    headers: { "content-type": contentType },
    limits: { files: 1, fields: MAX_FIELDS, fieldSize: MAX_FIELD_BYTES, fileSize: MAX_UPLOAD_BYTES + 1 },
  });
  const body = Readable.fromWeb(request.body as unknown as WebReadableStream<Uint8Array>);
  const fields: Record<string, string> = {};
  let staging: Promise<StagedFile> | null = null;
  let extraFile = false;
  let fileStream: Readable | null = null;

  const done = new Promise<void>((resolve, reject) => {
    parser.on("field", (name, value) => {
      if (name !== "fileName") fields[name] = value;
    });
    parser.on("file", (name, stream, info) => {
      if (name !== "file" || staging) {
        extraFile = true;
        stream.resume();
        return;
      }
      fields.fileName = info.filename ?? "";
      fileStream = stream;
      staging = stageUpload(stream);
      staging.catch((err: unknown) => {
        stream.resume(); // drain the rest of the part
        reject(err); // refuse now (e.g. too large) instead of reading the whole body
      });
    });
    parser.on("filesLimit", () => (extraFile = true));
    parser.on("error", (err) => reject(new ValidationError({ file: [`The upload could not be read: ${(err as Error).message}`] })));
    parser.on("close", () => resolve());
    body.on("error", () => reject(new ValidationError({ file: [INTERRUPTED] })));
  });
  body.pipe(parser);

  try {
    await done;
  } catch (err) {
    body.unpipe(parser);
    body.destroy();
    (fileStream as Readable | null)?.destroy(new Error(INTERRUPTED)); // ends the staging, which removes its temp file
    if (staging) await (staging as Promise<StagedFile>).then(discardStaged, () => undefined);
    throw err;
  }
  if (!staging) throw new ValidationError({ file: ["Attach the log file as the `file` part."] });
  const staged = await staging;
  if (extraFile) {
    discardStaged(staged);
    throw new ValidationError({ file: ["Send one log file per request, as the `file` part."] });
  }
  return { fields, staged };
}
