// Image pre-checks from a few frames (README "Other commands", `npm run precheck`): gain, unused depth, footprint shape and
// clip timing. These are hints shown to reviewers next to the clip; they never score anything.
//
// All thresholds below are OUR OWN STARTING VALUES, chosen on the project's synthetic clips
// (seeds/clips/generate.ts), not taken from any published standard; tune them on real clips.
import sharp from "sharp";
import type { Transducer } from "../../shared/catalogue";
import { ffmpeg, fileUrl, MediaError } from "./exec";
import { ffmpegTimeoutSeconds, MAX_PIXELS } from "./limits";
import { displaySize, parseRate, probe } from "./probe";
import { detectMedia } from "./detect";
import fsp from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { prepareDicom } from "./dicom/process";

export type GainHint = "low" | "balanced" | "high";
export type DepthHint = "too_deep" | "fits" | "maybe_shallow";
export type FootprintShape = "linear" | "curvilinear" | "phased" | "unknown";

export interface Precheck {
  gain: { hint: GainHint; meanLuma: number; saturatedShare: number };
  depth: { hint: DepthHint; unusedShare: number };
  footprint: { shape: FootprintShape };
  /** Where the imaging area was found, as shares of the frame (for drawing it over the poster). */
  area: { top: number; bottom: number; left: number; right: number } | null;
}

/** Where a calibrated depth (from DICOM) falls against the application's typical depth range. */
export type DepthAgainstTypical = "deeper_than_typical" | "shallower_than_typical" | "within_typical";

export interface PrecheckResult extends Omit<Precheck, "depth"> {
  depth: Precheck["depth"] & {
    /** Imaging depth in cm when the source was calibrated (a DICOM object's ultrasound regions). */
    cm?: number;
    /** The application's typical depth range in cm, as its catalogue entry states. */
    typicalCm?: [number, number];
    against?: DepthAgainstTypical;
  };
  clip: { seconds: number; fps: number; frames: number };
  /** Whether the footprint fits the transducer recorded on the exam; null when unknown or not given. */
  transducerMatch?: boolean | null;
}

/** A greyscale frame, one byte per pixel, row-major. */
export interface GreyFrame {
  width: number;
  height: number;
  data: Uint8Array;
}

// Starting values (ours; see header).
/** Mean luma of the imaging area (0–255) under which the gain hint is "low". */
export const GAIN_LOW_MEAN = 40;
/** Mean luma above which the gain hint is "high". */
export const GAIN_HIGH_MEAN = 130;
/** Share of pixels at ≥ 250 above which the gain hint is "high" whatever the mean. */
export const GAIN_HIGH_SATURATED = 0.05;
/** Luma counted as saturated. */
export const SATURATED_LUMA = 250;
/** A row of the imaging area is "featureless" when its mean is under this share of the tissue rows' median. */
export const FEATURELESS_SHARE = 0.3;
/** Unused share of the depth at or over which the hint is "too_deep". */
export const TOO_DEEP_SHARE = 0.25;
/** Unused share under which, with bright structure in the bottom rows, the hint is "maybe_shallow". */
export const SHALLOW_SHARE = 0.02;
/** Relative width change across the middle of the area under which the sides count as parallel (linear). */
export const PARALLEL_TOLERANCE = 0.08;
/** Distance of the sides' meeting point above the area's top, as a share of its height, under which it is a phased sector. */
export const PHASED_APEX = 0.15;
/** Analysis width in pixels: enough for shape and level, cheap to decode. */
export const ANALYSIS_WIDTH = 320;
/** Frames sampled from a clip. */
export const SAMPLE_FRAMES = 5;

const median = (xs: number[]) => {
  if (xs.length === 0) return 0;
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
};
const round = (v: number, d = 3) => Math.round(v * 10 ** d) / 10 ** d;

/** Mean of the frames, then a 5×5 box blur (so speckle and dark fluid do not punch holes in the mask). */
function meanAndBlur(frames: GreyFrame[]): { mean: Float32Array; blur: Float32Array } {
  const { width: w, height: h } = frames[0];
  const mean = new Float32Array(w * h);
  for (const f of frames) for (let i = 0; i < mean.length; i++) mean[i] += f.data[i] / frames.length;
  const tmp = new Float32Array(w * h);
  const blur = new Float32Array(w * h);
  const R = 2;
  for (let y = 0; y < h; y++)
    for (let x = 0; x < w; x++) {
      let s = 0;
      let n = 0;
      for (let k = -R; k <= R; k++) {
        if (x + k >= 0 && x + k < w) {
          s += mean[y * w + x + k];
          n++;
        }
      }
      tmp[y * w + x] = s / n;
    }
  for (let y = 0; y < h; y++)
    for (let x = 0; x < w; x++) {
      let s = 0;
      let n = 0;
      for (let k = -R; k <= R; k++) {
        if (y + k >= 0 && y + k < h) {
          s += tmp[(y + k) * w + x];
          n++;
        }
      }
      blur[y * w + x] = s / n;
    }
  return { mean, blur };
}

/** Theil–Sen-style robust slope and intercept of ys over xs (pairs half the band apart). */
function robustLine(xs: number[], ys: number[]): { slope: number; intercept: number } {
  const gap = Math.max(1, xs.length >> 1);
  const slopes: number[] = [];
  for (let i = 0; i + gap < xs.length; i++) slopes.push((ys[i + gap] - ys[i]) / (xs[i + gap] - xs[i]));
  const slope = median(slopes);
  return { slope, intercept: median(xs.map((x, i) => ys[i] - slope * x)) };
}

/**
 * The pre-check of a set of greyscale frames of one clip (same size). Pure: no files, no binaries.
 * The imaging area is the large non-black region; ultrasound shows bright speckle on black.
 */
export function analyseFrames(frames: GreyFrame[]): Precheck {
  if (frames.length === 0) throw new MediaError("No frames to check");
  const { width: w, height: h } = frames[0];
  const { mean, blur } = meanAndBlur(frames);

  // Background: the pure black around the sector (or the darkest tenth of the frame).
  const sample: number[] = [];
  for (let i = 0; i < blur.length; i += 7) sample.push(blur[i]);
  const bg = Math.min(20, median(sample.sort((a, b) => a - b).slice(0, Math.ceil(sample.length * 0.2))));
  const inArea = (i: number) => blur[i] > bg + 4;

  // Rows with enough area pixels; the longest run of such rows (small gaps bridged) is the
  // imaging area, which leaves burned-in text lines above or below it out.
  const minCount = Math.max(3, Math.round(w * 0.02));
  const spans: ({ l: number; r: number } | null)[] = [];
  for (let y = 0; y < h; y++) {
    let l = -1;
    let r = -1;
    let n = 0;
    for (let x = 0; x < w; x++)
      if (inArea(y * w + x)) {
        if (l < 0) l = x;
        r = x;
        n++;
      }
    spans.push(n >= minCount ? { l, r } : null);
  }
  let best = { top: 0, bottom: -1 };
  for (let y = 0, start = -1, gap = 0; y <= h; y++) {
    if (y < h && spans[y]) {
      if (start < 0) start = y;
      gap = 0;
    } else if (start >= 0 && (y === h || ++gap > 2)) {
      const end = y === h ? h - 1 - gap : y - gap;
      if (end - start > best.bottom - best.top) best = { top: start, bottom: end };
      start = -1;
      gap = 0;
    }
  }
  const areaH = best.bottom - best.top + 1;
  if (areaH < h * 0.15) {
    // No imaging area found: level hints from the whole frame, no shape or depth claim.
    const all = frames.flatMap((f) => Array.from(f.data));
    const m = all.reduce((a, b) => a + b, 0) / all.length;
    const sat = all.filter((v) => v >= SATURATED_LUMA).length / all.length;
    return {
      gain: { hint: gainHint(m, sat), meanLuma: round(m, 1), saturatedShare: round(sat) },
      depth: { hint: "fits", unusedShare: 0 },
      footprint: { shape: "unknown" },
      area: null,
    };
  }
  const rows = Array.from({ length: areaH }, (_, i) => best.top + i);
  const span = (y: number) => spans[y] ?? { l: 0, r: -1 };

  // Depth: featureless rows counted up from the bottom, against the tissue rows above.
  const rowMean = rows.map((y) => {
    const { l, r } = span(y);
    let s = 0;
    for (let x = l; x <= r; x++) s += mean[y * w + x];
    return r >= l ? s / (r - l + 1) : 0;
  });
  const reference = median(rowMean.slice(0, Math.max(1, Math.round(areaH * 0.6))));
  let unused = 0;
  while (unused < areaH && rowMean[areaH - 1 - unused] < Math.max(3, FEATURELESS_SHARE * reference)) unused++;
  const unusedShare = unused / areaH;
  const bottomRows = rowMean.slice(areaH - Math.max(2, Math.round(areaH * 0.05)));
  const bottomBright = bottomRows.reduce((a, b) => a + b, 0) / bottomRows.length >= 0.6 * reference;
  const depthHint: DepthHint = unusedShare >= TOO_DEEP_SHARE ? "too_deep" : unusedShare < SHALLOW_SHARE && bottomBright ? "maybe_shallow" : "fits";

  // Gain: the used part of the area (unused depth would drag the mean down), every frame.
  let sum = 0;
  let n = 0;
  let sat = 0;
  for (const f of frames)
    for (const y of rows.slice(0, areaH - unused)) {
      const { l, r } = span(y);
      for (let x = l; x <= r; x++) {
        const v = f.data[y * w + x];
        sum += v;
        n++;
        if (v >= SATURATED_LUMA) sat++;
      }
    }
  const meanLuma = n ? sum / n : 0;
  const saturatedShare = n ? sat / n : 0;

  // Footprint: how the width changes through the middle of the area. Parallel sides → linear;
  // sides meeting near the top (a small apex) → phased; meeting well above the top → curvilinear.
  const band = rows.filter((y) => y >= best.top + areaH * 0.3 && y <= best.top + areaH * 0.7);
  const widths = band.map((y) => span(y).r - span(y).l + 1);
  const { slope, intercept } = robustLine(band, widths);
  const midWidth = median(widths);
  let shape: FootprintShape = "unknown";
  if (midWidth > 0) {
    if (Math.abs(slope * band.length) / midWidth < PARALLEL_TOLERANCE) shape = "linear";
    else if (slope > 0) {
      const apexRow = -intercept / slope; // where the extrapolated width is zero
      const apexAbove = (best.top - apexRow) / areaH;
      shape = apexAbove < PHASED_APEX ? "phased" : "curvilinear";
    }
  }
  const lefts = rows.map((y) => span(y).l);
  const rights = rows.map((y) => span(y).r);
  return {
    gain: { hint: gainHint(meanLuma, saturatedShare), meanLuma: round(meanLuma, 1), saturatedShare: round(saturatedShare) },
    depth: { hint: depthHint, unusedShare: round(unusedShare) },
    footprint: { shape },
    area: { top: round(best.top / h), bottom: round((best.bottom + 1) / h), left: round(Math.min(...lefts) / w), right: round((Math.max(...rights) + 1) / w) },
  };
}

function gainHint(meanLuma: number, saturatedShare: number): GainHint {
  if (meanLuma > GAIN_HIGH_MEAN || saturatedShare > GAIN_HIGH_SATURATED) return "high";
  if (meanLuma < GAIN_LOW_MEAN) return "low";
  return "balanced";
}

/** Which footprints each recorded transducer makes (an endocavitary probe is a small curved array). */
const FOOTPRINTS: Record<Transducer, FootprintShape[]> = {
  linear: ["linear"],
  curvilinear: ["curvilinear"],
  phased: ["phased"],
  endocavitary: ["curvilinear", "phased"],
};

/** Does the footprint seen fit the transducer recorded? null when either is unknown. */
export function footprintMatches(shape: FootprintShape, transducer: Transducer | null | undefined): boolean | null {
  if (shape === "unknown" || !transducer || !(transducer in FOOTPRINTS)) return null;
  return FOOTPRINTS[transducer].includes(shape);
}

/** A few evenly spread greyscale frames of a video, decoded at analysis size by ffmpeg. */
export async function videoFrames(file: string): Promise<{ frames: GreyFrame[]; clip: PrecheckResult["clip"] }> {
  const p = await probe(file);
  if (!p.video?.width || !p.video.height) throw new MediaError("The file could not be read as video: it has no video stream");
  const size = displaySize(p.video);
  const width = Math.min(ANALYSIS_WIDTH, size.width - (size.width % 2));
  const height = Math.max(2, 2 * Math.round((size.height * width) / size.width / 2));
  const seconds = p.video.duration ?? p.duration ?? 0;
  const fps = parseRate(p.video.avgFrameRate) ?? parseRate(p.video.rFrameRate) ?? 0;
  const rate = seconds > 0 ? SAMPLE_FRAMES / seconds : 2;
  const out = await ffmpeg(
    [
      "-i",
      fileUrl(file),
      "-map",
      "0:v:0",
      "-vf",
      `fps=${rate.toFixed(6)}:start_time=0,scale=${width}:${height},format=gray`,
      "-frames:v",
      String(SAMPLE_FRAMES),
      "-f",
      "rawvideo",
      "pipe:1",
    ],
    "The file could not be read as video",
    { timeoutSeconds: ffmpegTimeoutSeconds(seconds) },
  );
  const frames: GreyFrame[] = [];
  for (let o = 0; o + width * height <= out.length; o += width * height) frames.push({ width, height, data: out.subarray(o, o + width * height) });
  if (frames.length === 0) throw new MediaError("The file could not be read as video: no frame could be decoded");
  const frameCount = p.video.nbFrames ?? Math.round(seconds * fps);
  return { frames, clip: { seconds: round(seconds, 2), fps: round(fps, 2), frames: frameCount } };
}

/** A still as one greyscale frame at analysis size (EXIF orientation applied). */
export async function stillFrame(file: string): Promise<GreyFrame> {
  try {
    const { data, info } = await sharp(file, { limitInputPixels: MAX_PIXELS })
      .rotate()
      .flatten({ background: "#000" })
      .resize({ width: ANALYSIS_WIDTH, withoutEnlargement: true })
      .toColourspace("b-w")
      .raw()
      .toBuffer({ resolveWithObject: true });
    const grey = info.channels === 1 ? data : Uint8Array.from({ length: info.width * info.height }, (_, i) => data[i * info.channels]);
    return { width: info.width, height: info.height, data: grey };
  } catch (err) {
    throw new MediaError(`The file could not be read as an image: ${(err as Error).message}`);
  }
}

/**
 * A calibrated depth against the application's typical range (its catalogue entry, which the
 * program edits). Within the range, or within 10 % of either end, counts as typical: a depth
 * set one step off on the machine is not worth a hint (our own allowance).
 */
export function depthAgainstTypical(cm: number, [min, max]: readonly [number, number]): DepthAgainstTypical {
  if (cm > max * 1.1) return "deeper_than_typical";
  if (cm < min * 0.9) return "shallower_than_typical";
  return "within_typical";
}

export interface PrecheckOptions {
  transducer?: Transducer | null;
  /** Imaging depth in cm the source states (DICOM region calibration); read from the file itself for DICOM. */
  depthCm?: number | null;
  /** The application's typical depth range in cm, to compare a calibrated depth with. */
  typicalDepthCm?: readonly [number, number] | null;
}

/**
 * The pre-check of a video, still or DICOM file. A DICOM object is decoded to frames first
 * (server/media/dicom) and its region calibration gives the depth in cm. Throws MediaError when
 * the file cannot be read.
 */
export async function precheckFile(file: string, opts: PrecheckOptions = {}): Promise<PrecheckResult> {
  const kind = await detectMedia(file);
  if (kind.kind === null) throw new MediaError(`Not a video or image: found ${kind.found}`);
  if (kind.kind === "dicom") {
    const work = await fsp.mkdtemp(path.join(os.tmpdir(), "soundings-precheck-"));
    try {
      const dicom = await prepareDicom(file, work);
      return await precheckFile(dicom.media, { ...opts, depthCm: dicom.facts.depthCm ?? opts.depthCm });
    } finally {
      await fsp.rm(work, { recursive: true, force: true });
    }
  }
  const { frames, clip } = kind.kind === "still" ? { frames: [await stillFrame(file)], clip: { seconds: 0, fps: 0, frames: 1 } } : await videoFrames(file);
  const result: PrecheckResult = { ...analyseFrames(frames), clip };
  if (opts.transducer !== undefined) result.transducerMatch = footprintMatches(result.footprint.shape, opts.transducer);
  if (typeof opts.depthCm === "number") {
    result.depth.cm = opts.depthCm;
    if (opts.typicalDepthCm) {
      result.depth.typicalCm = [opts.typicalDepthCm[0], opts.typicalDepthCm[1]];
      result.depth.against = depthAgainstTypical(opts.depthCm, opts.typicalDepthCm);
    }
  }
  return result;
}
