// Turns an uploaded video into what a reviewer plays: a web-playable H.264 MP4 without audio or
// metadata (stream copy when possible), plus a poster frame and a frame strip of that same picture
// (taken after redaction in a transcode; from the unchanged video packets in a copy).
import fs from "node:fs/promises";
import path from "node:path";
import sharp from "sharp";
import { ffmpeg, fileUrl, MediaError } from "./exec";
import { clearCompressorNames } from "./mp4";
import { ffmpegTimeoutSeconds } from "./limits";
import { ffmpegArgs, frameTapArgs, planVideo, type FrameTap, type Redaction, type VideoPlan } from "./plan";
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

/**
 * Times of the strip's frames: evenly spaced from the poster's time to the end, so the first
 * tile is the poster and one decode serves both.
 */
export function stripTimes(seconds: number): number[] {
  const t0 = posterTime(seconds);
  return Array.from({ length: STRIP_FRAMES }, (_, i) => t0 + (i * (seconds - t0)) / STRIP_FRAMES);
}

/** Clip length, frame rate and frame count from ffprobe's reading of an output. */
export function clipTiming(p: ProbeResult): { seconds: number; fps: number; frames: number } {
  const v = p.video;
  const seconds = v?.duration ?? p.duration ?? 0;
  const fps = parseRate(v?.avgFrameRate ?? null) ?? parseRate(v?.rFrameRate ?? null) ?? 0;
  const frames = v?.nbFrames ?? Math.round(seconds * fps);
  return { seconds, fps, frames };
}

/** Splits ffmpeg's raw RGB stdout into frames. */
function splitFrames(out: Buffer, width: number, height: number): Buffer[] {
  const size = width * height * 3;
  const frames: Buffer[] = [];
  for (let o = 0; o + size <= out.length; o += size) frames.push(out.subarray(o, o + size));
  return frames;
}

/** Spreads `got` frames over `want` slots (a clip with fewer frames than the strip repeats some). */
function spread<T>(got: T[], want: number): T[] {
  return Array.from({ length: want }, (_, i) => got[Math.floor((i * got.length) / want)]);
}

/** Decodes every frame of `file` and takes the first at or after each time. */
async function framesAt(file: string, times: number[], width: number, height: number, timeoutSeconds: number): Promise<Buffer[]> {
  const out = await ffmpeg(["-i", fileUrl(file), ...frameTapArgs({ times, width, height })], "Frames could not be taken from the processed video", {
    timeoutSeconds,
  });
  return splitFrames(out, width, height);
}

/** Writes the poster (the first strip frame, full size) and the strip (8 frames, 160 px high) as JPEG. */
async function writePosterAndStrip(frames: Buffer[], width: number, height: number, posterPath: string, stripPath: string) {
  if (frames.length === 0) throw new MediaError("Frames could not be taken from the processed video: it has no decodable frames");
  const strip = spread(frames, STRIP_FRAMES);
  const raw = { width, height, channels: 3 as const };
  const tileW = Math.max(2, 2 * Math.round((width * STRIP_HEIGHT) / height / 2));
  const [, tiles] = await Promise.all([
    sharp(strip[0], { raw }).jpeg({ quality: 85 }).toFile(posterPath),
    Promise.all(strip.map((f) => sharp(f, { raw }).resize(tileW, STRIP_HEIGHT, { fit: "fill" }).raw().toBuffer())),
  ]);
  await sharp({ create: { width: tileW * STRIP_FRAMES, height: STRIP_HEIGHT, channels: 3, background: "#000" } })
    .composite(tiles.map((t, i) => ({ input: t, raw: { width: tileW, height: STRIP_HEIGHT, channels: 3 as const }, left: i * tileW, top: 0 })))
    .jpeg({ quality: 80 })
    .toFile(stripPath);
}

/**
 * Processes one video into outDir (video.mp4, poster.jpg, strip.jpg) in one ffmpeg run that also
 * hands back the poster and strip frames: after scaling and redaction in a transcode; decoded
 * from the keyframes of the (byte-identical less SEI units, see the tests) video packets in a stream copy, with a
 * full decode of the output when the keyframes are too sparse. Throws MediaError with a readable
 * reason and removes its own partial outputs on failure.
 */
export async function processVideo(input: string, outDir: string, opts: { redactions?: Redaction[] } = {}): Promise<ProcessedVideo> {
  const redactions = opts.redactions ?? [];
  const source = await probe(input);
  const plan = planVideo(source, { redactions });
  const { seconds } = clipTiming(source);
  // Proportional to the length the file claims (a file that only claims to be short meets the floor).
  const timeoutSeconds = ffmpegTimeoutSeconds(seconds);
  await fs.mkdir(outDir, { recursive: true });
  const videoPath = path.join(outDir, "video.mp4");
  const posterPath = path.join(outDir, "poster.jpg");
  const stripPath = path.join(outDir, "strip.jpg");
  // Write under a temporary name so a crash never leaves a half file under the final name.
  const partial = path.join(outDir, `video.partial-${process.pid}-${Date.now()}.mp4`);
  const { width, height } = plan;
  const tap: FrameTap = { times: stripTimes(seconds), width, height, keyframesOnly: plan.video === "copy" };
  try {
    const out = await ffmpeg(ffmpegArgs(plan, fileUrl(input), fileUrl(partial), { redactions, tap }), "The video could not be converted", {
      timeoutSeconds,
    });
    if (plan.video === "transcode") await clearCompressorNames(partial);
    await fs.rename(partial, videoPath);
    let frames = splitFrames(out, width, height);
    // Keyframes too sparse for a full strip: decode the whole output instead.
    if (frames.length < Math.min(STRIP_FRAMES, tap.times.length) && plan.video === "copy")
      frames = await framesAt(videoPath, tap.times, width, height, timeoutSeconds);
    // A copy's video stream is the source's, so the source's reading stands; a transcode is read back.
    const [result] = await Promise.all([plan.video === "copy" ? source : probe(videoPath), writePosterAndStrip(frames, width, height, posterPath, stripPath)]);
    if (!result.video?.width || !result.video.height) throw new MediaError("The converted video has no picture");
    return { videoPath, posterPath, stripPath, plan, ...displaySize(result.video), ...clipTiming(result) };
  } catch (err) {
    await Promise.all([partial, videoPath, posterPath, stripPath].map((f) => fs.rm(f, { force: true })));
    throw err;
  }
}
