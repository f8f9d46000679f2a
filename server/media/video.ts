// Turns an uploaded video into what a reviewer plays: a web-playable H.264 MP4 without audio or
// metadata (stream copy when possible), plus a poster frame and a frame strip made from that output.
import fs from "node:fs/promises";
import path from "node:path";
import sharp from "sharp";
import { ffmpeg, fileUrl, MediaError } from "./exec";
import { ffmpegArgs, intermediates, planVideo, type Redaction, type VideoPlan } from "./plan";
import { displaySize, parseRate, probe, type ProbeResult } from "./probe";

export interface ProcessedVideo {
  videoPath: string;
  posterPath: string;
  stripPath: string;
  plan: VideoPlan;
  width: number;
  height: number;
  seconds: number;
  fps: number;
  frames: number;
}

/** Frames in the strip and the height of each. */
export const STRIP_FRAMES = 8;
export const STRIP_HEIGHT = 160;

/** Where the poster is taken: 10% into the clip, or 0.5 s into a short one (never past the middle). */
export function posterTime(seconds: number): number {
  return seconds >= 5 ? seconds * 0.1 : Math.min(0.5, seconds / 2);
}

/** Frame numbers for the poster and the strip (evenly spaced, centred in their slices). */
export function frameIndices(frames: number, seconds: number): { poster: number; strip: number[] } {
  const last = Math.max(0, frames - 1);
  const poster = Math.min(last, Math.round((posterTime(seconds) / Math.max(seconds, 1e-6)) * frames));
  const strip = Array.from({ length: STRIP_FRAMES }, (_, i) => Math.min(last, Math.floor(((i + 0.5) * frames) / STRIP_FRAMES)));
  return { poster, strip };
}

/** Clip length, frame rate and frame count from ffprobe's reading of an output. */
export function clipTiming(p: ProbeResult): { seconds: number; fps: number; frames: number } {
  const v = p.video;
  const seconds = v?.duration ?? p.duration ?? 0;
  const fps = parseRate(v?.avgFrameRate ?? null) ?? parseRate(v?.rFrameRate ?? null) ?? 0;
  const frames = v?.nbFrames ?? Math.round(seconds * fps);
  return { seconds, fps, frames };
}

/**
 * Decodes the chosen frames of `file` (one pass, stopping after the last one) as RGB frames
 * of the given size. Frames missing at the end (a short or odd clip) repeat the last one decoded.
 */
async function grabFrames(file: string, indices: number[], width: number, height: number): Promise<Buffer[]> {
  const unique = [...new Set(indices)].sort((a, b) => a - b);
  const select = unique.map((n) => `eq(n\\,${n})`).join("+");
  const out = await ffmpeg(
    [
      "-i", fileUrl(file),
      "-map", "0:v:0",
      "-vf", `select='${select}',scale=${width}:${height},format=rgb24`,
      "-fps_mode", "passthrough",
      "-frames:v", String(unique.length),
      "-f", "rawvideo", "pipe:1",
    ],
    "Frames could not be taken from the processed video",
  );
  const size = width * height * 3;
  const got: Buffer[] = [];
  for (let o = 0; o + size <= out.length; o += size) got.push(out.subarray(o, o + size));
  if (got.length === 0) throw new MediaError("Frames could not be taken from the processed video: it has no decodable frames");
  const byIndex = new Map(unique.map((n, i) => [n, got[Math.min(i, got.length - 1)]]));
  return indices.map((n) => byIndex.get(n)!);
}

/** Writes the poster (full size) and the strip (8 frames, 160 px high, side by side) as JPEG. */
async function makePosterAndStrip(file: string, p: ProbeResult, width: number, height: number, posterPath: string, stripPath: string) {
  const { seconds, frames } = clipTiming(p);
  const idx = frameIndices(Math.max(1, frames), seconds);
  const [poster, ...strip] = await grabFrames(file, [idx.poster, ...idx.strip], width, height);
  const raw = { width, height, channels: 3 as const };
  await sharp(poster, { raw }).jpeg({ quality: 85 }).toFile(posterPath);
  const tileW = Math.max(2, 2 * Math.round((width * STRIP_HEIGHT) / height / 2));
  const tiles = await Promise.all(
    strip.map((f) => sharp(f, { raw }).resize(tileW, STRIP_HEIGHT, { fit: "fill" }).raw().toBuffer()),
  );
  await sharp({ create: { width: tileW * STRIP_FRAMES, height: STRIP_HEIGHT, channels: 3, background: "#000" } })
    .composite(tiles.map((t, i) => ({ input: t, raw: { width: tileW, height: STRIP_HEIGHT, channels: 3 as const }, left: i * tileW, top: 0 })))
    .jpeg({ quality: 80 })
    .toFile(stripPath);
}

/**
 * Processes one video into outDir (video.mp4, poster.jpg, strip.jpg). Throws MediaError with a
 * readable reason; removes its own partial outputs on failure.
 */
export async function processVideo(input: string, outDir: string, opts: { redactions?: Redaction[] } = {}): Promise<ProcessedVideo> {
  const redactions = opts.redactions ?? [];
  const source = await probe(input);
  const plan = planVideo(source, { redactions });
  await fs.mkdir(outDir, { recursive: true });
  const videoPath = path.join(outDir, "video.mp4");
  const posterPath = path.join(outDir, "poster.jpg");
  const stripPath = path.join(outDir, "strip.jpg");
  // Write under a temporary name so a crash never leaves a half file under the final name.
  const partial = path.join(outDir, `video.partial-${process.pid}-${Date.now()}.mp4`);
  try {
    for (const step of ffmpegArgs(plan, fileUrl(input), fileUrl(partial), redactions)) {
      await ffmpeg(step, "The video could not be converted");
    }
    await Promise.all(intermediates(partial).map((f) => fs.rm(f, { force: true })));
    await fs.rename(partial, videoPath);
    const out = await probe(videoPath);
    if (!out.video?.width || !out.video.height) throw new MediaError("The converted video has no picture");
    // Decoders apply a display rotation, so frames come out at the displayed size.
    const { width, height } = displaySize(out.video);
    await makePosterAndStrip(videoPath, out, width, height, posterPath, stripPath);
    return { videoPath, posterPath, stripPath, plan, width, height, ...clipTiming(out) };
  } catch (err) {
    await Promise.all([partial, ...intermediates(partial), videoPath, posterPath, stripPath].map((f) => fs.rm(f, { force: true })));
    throw err;
  }
}
