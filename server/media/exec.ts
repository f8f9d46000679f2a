// Runs ffmpeg and ffprobe as child processes with argument arrays (never a shell string),
// and turns their failures into MediaError with the tool's own reason, trimmed for people.
import { execFile } from "node:child_process";
import path from "node:path";

/** An error about a media file that a person can read; safe to show on the clip. */
export class MediaError extends Error {
  override name = "MediaError";
}

export const FFMPEG = process.env.FFMPEG_PATH ?? "ffmpeg";
export const FFPROBE = process.env.FFPROBE_PATH ?? "ffprobe";

/** Keeps the useful tail of a tool's stderr: the last few distinct lines, at most ~300 characters. */
export function trimReason(stderr: string, args: readonly string[] = []): string {
  // Storage paths mean nothing to the person reading the error (and reveal the server's layout).
  let text = stderr;
  for (const a of args) if (a.startsWith("file:")) text = text.split(`${a}: `).join("").split(a).join("the file");
  const lines = text
    .split(/\r?\n/)
    .map((l) => l.trim())
    .filter(Boolean);
  const tail = [...new Set(lines.slice(-3))].join("; ");
  return tail.length > 300 ? `${tail.slice(0, 297)}...` : tail || "no reason given";
}

/** Runs a binary and resolves with its stdout as a Buffer; rejects with stderr attached. */
export function runTool(bin: string, args: string[], opts: { maxBuffer?: number } = {}): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    execFile(bin, args, { encoding: "buffer", maxBuffer: opts.maxBuffer ?? 256 * 1024 * 1024, windowsHide: true }, (err, stdout, stderr) => {
      if (err) {
        const e = err as NodeJS.ErrnoException & { stderrText?: string };
        e.stderrText = stderr.toString("utf8");
        reject(e);
      } else resolve(stdout);
    });
  });
}

/** Runs ffmpeg; a failure becomes a MediaError that starts with `what` and ends with ffmpeg's reason. */
export async function ffmpeg(args: string[], what: string, opts: { maxBuffer?: number } = {}): Promise<Buffer> {
  try {
    return await runTool(FFMPEG, ["-nostdin", "-hide_banner", "-v", "error", ...args], opts);
  } catch (err) {
    const e = err as NodeJS.ErrnoException & { stderrText?: string };
    if (e.code === "ENOENT") throw new MediaError("ffmpeg is not installed on this server");
    throw new MediaError(`${what}: ${trimReason(e.stderrText ?? e.message, args)}`);
  }
}

/**
 * An input/output argument for ffmpeg/ffprobe: the absolute path behind the `file:` protocol,
 * so a name like "-x" or "http:..." can never be read as an option or another protocol.
 */
export function fileUrl(p: string): string {
  return `file:${path.resolve(p)}`;
}
