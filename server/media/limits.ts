// What the media pipeline accepts and how long it lets ffmpeg/ffprobe run. POCUS clips are a few
// seconds long and ultrasound frames are at most a few megapixels (common practice), so these caps
// sit far above real uploads and far below what would starve a worker of memory or time.
// Each can be set by an environment variable (see the README's configuration table).

const envNumber = (name: string, fallback: number): number => {
  const raw = process.env[name];
  if (raw === undefined || raw === "") return fallback;
  const n = Number(raw);
  if (!Number.isFinite(n) || n <= 0) throw new Error(`${name} must be a positive number, got "${raw}"`);
  return n;
};

/** Longest clip accepted, in seconds (POCUS clips are seconds long). */
export const MAX_CLIP_SECONDS = envNumber("MEDIA_MAX_SECONDS", 10 * 60);
/** Most pixels in one image or video frame (50 megapixels). */
export const MAX_PIXELS = envNumber("MEDIA_MAX_MEGAPIXELS", 50) * 1_000_000;
/** Longest side of a video frame, in pixels. */
export const MAX_VIDEO_SIDE = envNumber("MEDIA_MAX_VIDEO_SIDE", 8192);

/** An ffprobe run (it reads headers and a few packets). */
export const PROBE_TIMEOUT_SECONDS = envNumber("MEDIA_PROBE_TIMEOUT_SECONDS", 30);
/** Least time an ffmpeg run over a clip gets, however short the clip. */
export const FFMPEG_TIMEOUT_MIN_SECONDS = envNumber("MEDIA_FFMPEG_TIMEOUT_MIN_SECONDS", 60);
/** Seconds of ffmpeg time allowed per second of clip. */
export const FFMPEG_TIMEOUT_PER_CLIP_SECOND = envNumber("MEDIA_FFMPEG_TIMEOUT_PER_CLIP_SECOND", 10);
/**
 * Most time any ffmpeg run gets. Kept under the clip job's expiry (JOB_EXPIRE_SECONDS, 15 min by
 * default) so the queue never hands a job to a second worker while the first is still encoding.
 */
export const FFMPEG_TIMEOUT_MAX_SECONDS = envNumber("MEDIA_FFMPEG_TIMEOUT_MAX_SECONDS", 12 * 60);

/** The time limit of an ffmpeg run over a clip of `seconds` (unknown length: the ceiling). */
export function ffmpegTimeoutSeconds(seconds: number | null | undefined): number {
  if (seconds === null || seconds === undefined || !Number.isFinite(seconds) || seconds <= 0) return FFMPEG_TIMEOUT_MAX_SECONDS;
  return Math.min(FFMPEG_TIMEOUT_MAX_SECONDS, Math.max(FFMPEG_TIMEOUT_MIN_SECONDS, Math.ceil(seconds * FFMPEG_TIMEOUT_PER_CLIP_SECOND)));
}

const megapixels = (n: number) => `${Math.round((n / 1_000_000) * 10) / 10} megapixels`;

/** Why an image of this size is refused, or null when it is within the limit. */
export function imageSizeProblem(width: number, height: number): string | null {
  if (width * height > MAX_PIXELS) return `The image is ${width}×${height} pixels; the limit is ${megapixels(MAX_PIXELS)}`;
  return null;
}

/** Why a video frame of this size is refused, or null when it is within the limits. */
export function videoSizeProblem(width: number, height: number): string | null {
  if (width > MAX_VIDEO_SIDE || height > MAX_VIDEO_SIDE) {
    return `The video is ${width}×${height} pixels; the limit is ${MAX_VIDEO_SIDE} pixels on a side`;
  }
  if (width * height > MAX_PIXELS) return `The video is ${width}×${height} pixels; the limit is ${megapixels(MAX_PIXELS)} a frame`;
  return null;
}

/** Why a clip of this length is refused, or null when it is within the limit. */
export function durationProblem(seconds: number | null | undefined): string | null {
  if (seconds !== null && seconds !== undefined && seconds > MAX_CLIP_SECONDS) {
    return `The clip is ${Math.round(seconds)} s long; the limit is ${Math.round(MAX_CLIP_SECONDS)} s (${Math.round(MAX_CLIP_SECONDS / 60)} minutes)`;
  }
  return null;
}
