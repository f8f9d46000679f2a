// The one way the client saves a file: a file the server makes (fetched with the session
// cookie; a refusal's JSON error body becomes an ApiError through src/lib/api-errors.ts, the
// name comes from Content-Disposition) or one built in the browser, saved through a
// temporary link whose object URL is released afterwards.
import { apiErrorFrom, defaultMessage, networkError } from "./api-errors";

/** The file name from a Content-Disposition header (RFC 6266: filename* wins over filename). */
export function fileNameFrom(disposition: string | null, fallback: string): string {
  if (!disposition) return fallback;
  const star = /filename\*\s*=\s*(?:UTF-8|utf-8)''([^;]+)/.exec(disposition);
  if (star) {
    try {
      return decodeURIComponent(star[1].trim());
    } catch {
      // Malformed escapes: fall through to the plain name.
    }
  }
  const plain = /filename\s*=\s*(?:"((?:\\.|[^"\\])*)"|([^;]+))/.exec(disposition);
  const name = plain ? (plain[1] ?? plain[2]).replace(/\\(.)/g, "$1").trim() : "";
  // Only a bare file name is ever used, whatever the header says.
  return name.replace(/[/\\]/g, "_") || fallback;
}

/** Saves a blob as a file named `name` through a temporary link; the object URL is released once the browser has taken it. */
export function saveBlob(blob: Blob, name: string): void {
  const url = URL.createObjectURL(blob);
  const a = document.createElement("a");
  a.href = url;
  a.download = name;
  document.body.append(a);
  a.click();
  a.remove();
  // Give the browser a moment to start the download before the address is released.
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

export interface DownloadOptions {
  /** The media types asked for (the Accept header). */
  accept: string;
  /** The name used when the answer names no file. */
  fallbackName: string;
  signal?: AbortSignal;
  /** What a refusal says when the server sent no message; by default the status's own message. */
  refusedMessage?: (status: number) => string;
}

/**
 * Fetches /api{path} as a file with the session and saves it under the server's file name,
 * which it returns. A refusal becomes an ApiError with the server's code and message, a
 * request that never reached the server a network error; an abort is passed on as it is.
 */
export async function downloadFile(path: string, options: DownloadOptions): Promise<string> {
  const { accept, fallbackName, signal, refusedMessage = defaultMessage } = options;
  let response: Response;
  try {
    response = await fetch(`/api${path}`, { credentials: "include", signal, headers: { Accept: accept } });
  } catch (error) {
    if (error instanceof DOMException && error.name === "AbortError") throw error;
    throw networkError();
  }
  if (!response.ok) {
    const body: unknown = await response.json().catch(() => undefined);
    throw apiErrorFrom(response.status, body, refusedMessage(response.status));
  }
  const blob = await response.blob();
  const name = fileNameFrom(response.headers.get("Content-Disposition"), fallbackName);
  saveBlob(blob, name);
  return name;
}
