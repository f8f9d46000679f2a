// File uploads with progress. fetch() reports no upload progress, so this one call uses
// XMLHttpRequest, sending the session cookie and turning failures into ApiError like api().
import { apiErrorFrom, networkError } from "./api-errors";

export interface UploadOptions {
  /** Extra multipart fields sent before the file. */
  fields?: Record<string, string>;
  /** Called with 0–1 as bytes leave the browser. */
  onProgress?: (share: number) => void;
  signal?: AbortSignal;
}

/** POSTs one file as multipart field `file` to /api{path} and returns the parsed JSON answer. */
export function uploadFile<T>(path: string, file: File, options: UploadOptions = {}): Promise<T> {
  const { fields = {}, onProgress, signal } = options;
  return new Promise<T>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open("POST", `/api${path}`);
    xhr.withCredentials = true;
    xhr.setRequestHeader("Accept", "application/json");
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable && e.total > 0) onProgress?.(e.loaded / e.total);
    };
    xhr.onload = () => {
      let data: unknown;
      try {
        data = xhr.responseText ? JSON.parse(xhr.responseText) : undefined;
      } catch {
        data = undefined;
      }
      if (xhr.status >= 200 && xhr.status < 300) {
        onProgress?.(1);
        resolve(data as T);
        return;
      }
      reject(apiErrorFrom(xhr.status, data, `The upload was refused (HTTP ${xhr.status}).`));
    };
    xhr.onerror = () => reject(networkError("The upload was interrupted. Check the connection and try again."));
    xhr.onabort = () => reject(new DOMException("The upload was cancelled.", "AbortError"));
    signal?.addEventListener("abort", () => xhr.abort(), { once: true });

    const form = new FormData();
    for (const [name, value] of Object.entries(fields)) form.append(name, value);
    form.append("file", file, file.name);
    xhr.send(form);
  });
}
