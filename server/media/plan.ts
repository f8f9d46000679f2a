// The pure decision of what to do with an uploaded video (stream copy or transcode) and the
// ffmpeg arguments that carry it out. No binaries here, so every branch is unit-tested.
import { MediaError } from "./exec";
import { durationProblem, videoSizeProblem } from "./limits";
import { displaySize, type ProbeResult } from "./probe";

/** A redaction box in normalised frame coordinates (0–1, origin top left). */
export interface Redaction {
  x: number;
  y: number;
  w: number;
  h: number;
}

/** A redaction box in output pixels. */
export interface PixelBox {
  x: number;
  y: number;
  w: number;
  h: number;
}

export interface VideoPlan {
  video: "copy" | "transcode";
  /** Why a transcode is needed (empty for copy). */
  reasons: string[];
  /** Displayed size of the source. */
  source: { width: number; height: number };
  /** Size of the output (even, fits 1080p). */
  width: number;
  height: number;
}

/** The long and short side limits of "at or under 1080p", in either orientation. */
export const MAX_LONG_SIDE = 1920;
export const MAX_SHORT_SIDE = 1080;

/** Encoder settings of the transcode (a quality/speed balance for review, not archiving). */
export const X264 = { preset: "veryfast", crf: 23 } as const;

/** Keeps boxes inside the frame and drops empty ones; throws on values that are not numbers. */
export function cleanRedactions(boxes: readonly Redaction[] | undefined): Redaction[] {
  const out: Redaction[] = [];
  for (const b of boxes ?? []) {
    if (![b.x, b.y, b.w, b.h].every((v) => typeof v === "number" && Number.isFinite(v))) {
      throw new MediaError("A redaction box has a coordinate that is not a number");
    }
    const x0 = Math.min(1, Math.max(0, b.x));
    const y0 = Math.min(1, Math.max(0, b.y));
    const x1 = Math.min(1, Math.max(0, b.x + b.w));
    const y1 = Math.min(1, Math.max(0, b.y + b.h));
    if (x1 > x0 && y1 > y0) out.push({ x: x0, y: y0, w: x1 - x0, h: y1 - y0 });
  }
  return out;
}

/** Scales (width, height) down to fit 1920×1080 in its own orientation, keeping the aspect, both even. */
export function fitWithin1080(width: number, height: number): { width: number; height: number } {
  const long = Math.max(width, height);
  const short = Math.min(width, height);
  const k = Math.min(1, MAX_LONG_SIDE / long, MAX_SHORT_SIDE / short);
  const even = (v: number) => Math.max(2, 2 * Math.round((v * k) / 2));
  return { width: even(width), height: even(height) };
}

const isMp4OrMov = (formatName: string) => formatName.split(",").some((f) => f === "mp4" || f === "mov");

/** Decides stream copy or transcode from ffprobe's reading and the redaction boxes. */
export function planVideo(p: ProbeResult, opts: { redactions?: readonly Redaction[] } = {}): VideoPlan {
  const v = p.video;
  if (!v || !v.width || !v.height) throw new MediaError("The file could not be read as video: it has no video stream");
  // The longer of the stream's and the container's claim: either may be what the decoder will meet.
  const tooLong = durationProblem(Math.max(v.duration ?? 0, p.duration ?? 0));
  if (tooLong) throw new MediaError(tooLong);
  // A frame this large would take a worker's memory in one decode; no ultrasound system makes one.
  const tooBig = videoSizeProblem(v.width, v.height);
  if (tooBig) throw new MediaError(tooBig);
  const source = displaySize(v);
  const reasons: string[] = [];
  if (v.codecName !== "h264") reasons.push(`video codec is ${v.codecName ?? "unknown"}, not H.264`);
  if (v.pixFmt !== "yuv420p") reasons.push(`pixel format is ${v.pixFmt ?? "unknown"}, not yuv420p`);
  if (!isMp4OrMov(p.formatName)) reasons.push(`container is ${p.formatName}, not MP4/MOV`);
  const long = Math.max(source.width, source.height);
  const short = Math.min(source.width, source.height);
  if (long > MAX_LONG_SIDE || short > MAX_SHORT_SIDE) reasons.push(`${source.width}×${source.height} is larger than 1080p`);
  if (cleanRedactions(opts.redactions).length > 0) reasons.push("redaction boxes are set");
  if (reasons.length === 0) return { video: "copy", reasons, source, width: source.width, height: source.height };
  return { video: "transcode", reasons, source, ...fitWithin1080(source.width, source.height) };
}

/**
 * Normalised boxes → output pixels, widened outward to even pixel edges so that 4:2:0 chroma
 * (one sample per 2×2 block) cannot bleed image colour into the edge of a box.
 */
export function redactionPixels(boxes: readonly Redaction[], width: number, height: number): PixelBox[] {
  return cleanRedactions(boxes).map((b) => {
    const x0 = Math.max(0, 2 * Math.floor((b.x * width) / 2));
    const y0 = Math.max(0, 2 * Math.floor((b.y * height) / 2));
    const x1 = Math.min(width, 2 * Math.ceil(((b.x + b.w) * width) / 2));
    const y1 = Math.min(height, 2 * Math.ceil(((b.y + b.h) * height) / 2));
    return { x: x0, y: y0, w: x1 - x0, h: y1 - y0 };
  });
}

/**
 * Output options every result gets: no audio, subtitles, data, chapters or container/stream
 * metadata; bitexact so no "encoder" tag or version string is written; moov first.
 */
/**
 * Drops every SEI NAL unit (type 6, ITU-T H.264 Table 7-1) from the H.264 stream. SEI "user data"
 * messages can carry anything a device writes, a patient's name or record number included, and
 * nothing a reviewer's player needs is in them (timing and recovery hints only; MP4 marks its own
 * sync samples). Used on both paths: a stream copy passes the source's SEI through unchanged, and
 * libx264 always writes its own version-and-settings SEI, which no x264 option turns off, and
 * re-inserts captions carried over from the source (ffmpeg's a53cc), so its output is filtered too.
 */
const STRIP_SEI = ["-bsf:v", "filter_units=remove_types=6"];

const COMMON_OUTPUT = ["-an", "-sn", "-dn", "-map_metadata", "-1", "-map_chapters", "-1", "-fflags", "+bitexact", "-movflags", "+faststart"];

/**
 * Frames to hand back for the poster and strip, as raw RGB on stdout, in the same ffmpeg run.
 * `times` are seconds; each picks the first frame at or after it. `keyframesOnly` (stream copy
 * only) decodes keyframes and nothing else, which is what lets a copy run far faster than real time.
 */
export interface FrameTap {
  times: number[];
  width: number;
  height: number;
  keyframesOnly?: boolean;
}

/** An ffmpeg `select` expression that passes the first frame at or after each time. */
export function selectAtTimes(times: readonly number[]): string {
  const terms = times.map((t) => {
    const T = t.toFixed(4);
    return `gte(t\\,${T})*(isnan(prev_pts)+lt(prev_pts*TB\\,${T}))`;
  });
  return `select='gt(${terms.join("+")}\\,0)'`;
}

/** Output arguments for a frame tap: from a filtergraph label, or decoded from the first input's video. */
export const frameTapArgs = (tap: FrameTap, label: string | null = null): string[] => [
  ...(label ? ["-map", label] : ["-map", "0:v:0", "-vf", `${selectAtTimes(tap.times)},scale=${tap.width}:${tap.height},format=rgb24`]),
  "-fps_mode",
  "passthrough",
  "-frames:v",
  String(tap.times.length),
  "-f",
  "rawvideo",
  "pipe:1",
];

/**
 * The ffmpeg arguments (after the global ones) that turn `input` into `output` per the plan, in
 * one run; with a tap, the poster and strip frames also come out on stdout. In a transcode they
 * are taken after scaling and redaction, so the boxes are in them too.
 */
export function ffmpegArgs(plan: VideoPlan, input: string, output: string, opts: { redactions?: readonly Redaction[]; tap?: FrameTap } = {}): string[] {
  const { tap } = opts;
  if (plan.video === "copy") {
    return [
      ...(tap?.keyframesOnly ? ["-skip_frame", "nokey"] : []),
      "-i",
      input,
      "-map",
      "0:v:0",
      ...COMMON_OUTPUT,
      "-c:v",
      "copy",
      ...STRIP_SEI,
      "-f",
      "mp4",
      "-y",
      output,
      ...(tap ? frameTapArgs(tap) : []),
    ];
  }
  const filters = [`scale=${plan.width}:${plan.height}:flags=bicubic`, "setsar=1"];
  for (const b of redactionPixels(opts.redactions ?? [], plan.width, plan.height)) {
    filters.push(`drawbox=x=${b.x}:y=${b.y}:w=${b.w}:h=${b.h}:color=black:t=fill`);
  }
  filters.push("format=yuv420p");
  const graph = tap
    ? `[0:v:0]${filters.join(",")},split=2[enc][tap];[tap]${selectAtTimes(tap.times)},scale=${tap.width}:${tap.height},format=rgb24[frames]`
    : `[0:v:0]${filters.join(",")}[enc]`;
  return [
    "-i",
    input,
    "-filter_complex",
    graph,
    "-map",
    "[enc]",
    ...COMMON_OUTPUT,
    "-c:v",
    "libx264",
    "-preset",
    X264.preset,
    "-crf",
    String(X264.crf),
    "-pix_fmt",
    "yuv420p",
    // A keyframe every second: reviewers seek and step through frames.
    "-force_key_frames",
    "expr:gte(t,n_forced*1)",
    "-flags:v",
    "+bitexact",
    ...STRIP_SEI,
    "-f",
    "mp4",
    "-y",
    output,
    ...(tap ? frameTapArgs(tap, "[frames]") : []),
  ];
}
