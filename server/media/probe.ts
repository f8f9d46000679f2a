// Reads a media file with ffprobe and returns the typed subset the pipeline decides on.
import { FFPROBE, MediaError, fileUrl, runTool, toolFailure } from "./exec";
import { PROBE_TIMEOUT_SECONDS } from "./limits";

export interface ProbeStream {
  index: number;
  codecType: string; // "video" | "audio" | "subtitle" | "data" | ...
  codecName: string | null;
  pixFmt: string | null;
  width: number | null;
  height: number | null;
  rFrameRate: string | null;
  avgFrameRate: string | null;
  nbFrames: number | null;
  duration: number | null;
  /** Display rotation in degrees from the stream's display matrix (phones), 0 when none. */
  rotation: number;
  tags: Record<string, string>;
}

export interface ProbeResult {
  formatName: string; // e.g. "mov,mp4,m4a,3gp,3g2,mj2", "avi", "matroska,webm"
  duration: number | null;
  tags: Record<string, string>;
  streams: ProbeStream[];
  /** The first video stream, if any. */
  video: ProbeStream | null;
}

interface RawStream {
  index?: number;
  codec_type?: string;
  codec_name?: string;
  pix_fmt?: string;
  width?: number;
  height?: number;
  r_frame_rate?: string;
  avg_frame_rate?: string;
  nb_frames?: string;
  duration?: string;
  tags?: Record<string, string>;
  side_data_list?: { rotation?: number }[];
}

const num = (v: string | number | undefined): number | null => {
  const n = typeof v === "number" ? v : v === undefined ? NaN : Number(v);
  return Number.isFinite(n) ? n : null;
};

/** Parses ffprobe's JSON (exported for tests); throws MediaError when there is nothing usable. */
export function parseProbe(json: string): ProbeResult {
  let raw: { format?: { format_name?: string; duration?: string; tags?: Record<string, string> }; streams?: RawStream[] };
  try {
    raw = JSON.parse(json);
  } catch {
    throw new MediaError("The file could not be read as video: the reader's answer was not understood");
  }
  if (!raw.format) throw new MediaError("The file could not be read as video: no container found");
  const streams: ProbeStream[] = (raw.streams ?? []).map((s) => ({
    index: s.index ?? 0,
    codecType: s.codec_type ?? "unknown",
    codecName: s.codec_name ?? null,
    pixFmt: s.pix_fmt ?? null,
    width: num(s.width),
    height: num(s.height),
    rFrameRate: s.r_frame_rate ?? null,
    avgFrameRate: s.avg_frame_rate ?? null,
    nbFrames: num(s.nb_frames),
    duration: num(s.duration),
    rotation: num(s.side_data_list?.find((d) => d.rotation !== undefined)?.rotation) ?? 0,
    tags: s.tags ?? {},
  }));
  return {
    formatName: raw.format.format_name ?? "unknown",
    duration: num(raw.format.duration),
    tags: raw.format.tags ?? {},
    streams,
    video: streams.find((s) => s.codecType === "video") ?? null,
  };
}

/** ffprobe's reading of a file. Throws MediaError ("The file could not be read as video: ...") on failure. */
export async function probe(filePath: string): Promise<ProbeResult> {
  let out: Buffer;
  const args = ["-v", "error", "-print_format", "json", "-show_format", "-show_streams", fileUrl(filePath)];
  try {
    out = await runTool(FFPROBE, args, { timeoutSeconds: PROBE_TIMEOUT_SECONDS });
  } catch (err) {
    throw toolFailure("ffprobe", err, "The file could not be read as video", args);
  }
  return parseProbe(out.toString("utf8"));
}

/** Parses an ffprobe rate such as "30000/1001"; null for "0/0" or garbage. */
export function parseRate(rate: string | null): number | null {
  if (!rate) return null;
  const [a, b] = rate.split("/").map(Number);
  const v = b === undefined ? a : a / b;
  return Number.isFinite(v) && v > 0 ? v : null;
}

/** Width and height as displayed (a 90° display rotation swaps them). */
export function displaySize(v: ProbeStream): { width: number; height: number } {
  const w = v.width ?? 0;
  const h = v.height ?? 0;
  return Math.abs(v.rotation) % 180 === 90 ? { width: h, height: w } : { width: w, height: h };
}
