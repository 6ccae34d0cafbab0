/**
 * One log upload over XMLHttpRequest (fetch has no upload progress): multipart to the log API
 * with the session cookie; resolves with the JSON answer and the HTTP status.
 */
export interface UploadAnswer {
  status: number;
  body: unknown;
}

export function sendLogUpload(
  url: string,
  file: File,
  fields: Record<string, string>,
  onProgress: (fraction: number) => void,
): { done: Promise<UploadAnswer>; abort: () => void } {
  const xhr = new XMLHttpRequest();
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) if (v !== "") form.append(k, v);
  form.append("file", file, file.name);
  const done = new Promise<UploadAnswer>((resolve, reject) => {
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable && e.total > 0) onProgress(e.loaded / e.total);
    };
    xhr.upload.onload = () => onProgress(1);
    xhr.onload = () => {
      let body: unknown = null;
      try {
        body = JSON.parse(xhr.responseText);
      } catch {
        body = null;
      }
      resolve({ status: xhr.status, body });
    };
    xhr.onerror = () => reject(new Error("The connection dropped during the upload. Nothing was kept; upload the file again."));
    xhr.onabort = () => reject(new Error("Upload cancelled. Nothing was kept."));
  });
  xhr.open("POST", url);
  xhr.setRequestHeader("Accept", "application/json");
  xhr.send(form);
  return { done, abort: () => xhr.abort() };
}
