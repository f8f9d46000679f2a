// Runs ffmpeg and ffprobe as child processes with argument arrays (never a shell string),
// and turns their failures into MediaError with the tool's own reason, trimmed for people.
import { execFile } from "node:child_process";
import path from "node:path";
import { FFMPEG_TIMEOUT_MAX_SECONDS } from "./limits";

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
  // "[mov,mp4,m4a,3gp,3g2,mj2 @ 0x55d0c0a1b480] " names a demuxer instance by its memory address.
  text = text.replace(/\[[^\]\n]* @ 0x[0-9a-f]+\] /g, "");
  const lines = text
    .split(/\r?\n/)
    .map((l) => l.trim())
    .filter(Boolean);
  const tail = [...new Set(lines.slice(-3))].join("; ");
  return tail.length > 300 ? `${tail.slice(0, 297)}...` : tail || "no reason given";
}

/** How a run of a tool ended when it did not succeed. */
type ToolError = NodeJS.ErrnoException & { stderrText?: string; timedOutAfter?: number };

/**
 * Runs a binary and resolves with its stdout as a Buffer; rejects with stderr attached. A run
 * longer than `timeoutSeconds` is killed with SIGKILL (a stuck decoder ignores gentler signals)
 * and rejects with `timedOutAfter` set.
 */
export function runTool(bin: string, args: string[], opts: { maxBuffer?: number; timeoutSeconds: number }): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    let timedOut = false;
    const child = execFile(bin, args, { encoding: "buffer", maxBuffer: opts.maxBuffer ?? 256 * 1024 * 1024, windowsHide: true }, (err, stdout, stderr) => {
      clearTimeout(timer);
      if (err || timedOut) {
        const e = (err ?? new Error(`${path.basename(bin)} was stopped`)) as ToolError;
        e.stderrText = stderr.toString("utf8");
        if (timedOut) e.timedOutAfter = opts.timeoutSeconds;
        reject(e);
      } else resolve(stdout);
    });
    const timer = setTimeout(() => {
      timedOut = true;
      child.kill("SIGKILL");
    }, opts.timeoutSeconds * 1000);
  });
}

/** A tool's failure as a MediaError: not installed, too slow, or its own reason after `what`. */
export function toolFailure(tool: "ffmpeg" | "ffprobe", err: unknown, what: string, args: readonly string[]): MediaError {
  const e = err as ToolError;
  if (e.code === "ENOENT") return new MediaError(`${tool} is not installed on this server`);
  if (e.timedOutAfter !== undefined) return new MediaError(`${what}: ${tool} took longer than ${e.timedOutAfter} s and was stopped`);
  return new MediaError(`${what}: ${trimReason(e.stderrText ?? e.message, args)}`);
}

/**
 * Runs ffmpeg, killed after `timeoutSeconds` (default: the ceiling of every run); a failure becomes
 * a MediaError that starts with `what` and ends with ffmpeg's reason.
 */
export async function ffmpeg(args: string[], what: string, opts: { maxBuffer?: number; timeoutSeconds?: number } = {}): Promise<Buffer> {
  try {
    return await runTool(FFMPEG, ["-nostdin", "-hide_banner", "-v", "error", ...args], {
      maxBuffer: opts.maxBuffer,
      timeoutSeconds: opts.timeoutSeconds ?? FFMPEG_TIMEOUT_MAX_SECONDS,
    });
  } catch (err) {
    throw toolFailure("ffmpeg", err, what, args);
  }
}

/**
 * An input/output argument for ffmpeg/ffprobe: the absolute path behind the `file:` protocol,
 * so a name like "-x" or "http:..." can never be read as an option or another protocol.
 */
export function fileUrl(p: string): string {
  return `file:${path.resolve(p)}`;
}
