// Invented, ultrasound-like demo clips and stills for the seed and for tests: grey speckle in a
// linear, curvilinear or phased footprint on black, dark "fluid" ellipses, slow drift over time
// and a burned-in text line. No real images, people, places or devices: everything is made here.
import { existsSync } from "node:fs";
import fs from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import sharp from "sharp";
import { ffmpeg, fileUrl } from "../../server/media/exec";

export type Footprint = "linear" | "curvilinear" | "phased";

export interface DemoImageOptions {
  footprint: Footprint;
  width: number;
  height: number;
  gain?: "low" | "balanced" | "high";
  /** Share (0–1) of the bottom of the imaging area left featureless (deep field beyond the target). */
  unusedDepth?: number;
  /** Dark, anechoic ellipses in the tissue. Default true. */
  fluid?: boolean;
  /** Burned-in line at the top (invented). Default "CEDAR HOLLOW  C5  12cm". */
  label?: string;
  /** Seed of the pseudo-random speckle, so the same options give the same picture. */
  seed?: number;
}

export interface DemoClipOptions extends DemoImageOptions {
  seconds: number;
  fps: number;
  container?: "mp4" | "mov" | "mkv" | "avi" | "webm";
  codec?: "h264" | "hevc" | "mpeg4" | "vp9";
  pixFmt?: "yuv420p" | "yuv422p";
  /** Add a sine-tone audio track (to prove the pipeline drops it). */
  audio?: boolean;
  /** Container metadata to write (to prove the pipeline strips it). */
  metadata?: Record<string, string>;
  /** Force a keyframe every this many seconds (default: the encoder's own choice). */
  keyframeEvery?: number;
}

/** Gain multipliers of the synthetic picture (balanced gives a mean luma of about 80 in the imaging area). */
const GAIN = { low: 0.35, balanced: 1, high: 2.2 } as const;
/** Brightness of the deep field beyond the target: dark but above the pure black outside the sector. */
const DEEP_FIELD = 0.14;
/** Drift of the tissue, in pixels, over the clip. */
const PAD = 16;

const FONT_CANDIDATES = [
  "/usr/share/fonts/truetype/dejavu/DejaVuSansMono.ttf",
  "/usr/share/fonts/truetype/dejavu/DejaVuSans.ttf",
  "/usr/share/fonts/truetype/liberation/LiberationMono-Regular.ttf",
];

function rng(seed: number) {
  let s = seed >>> 0 || 1;
  return () => {
    // xorshift32: fast and reproducible; quality is irrelevant for speckle.
    s ^= s << 13;
    s ^= s >>> 17;
    s ^= s << 5;
    return (s >>> 0) / 4294967296;
  };
}

/** Geometry of the imaging area in frame pixels. */
function geometry(o: DemoImageOptions) {
  const top = Math.round(o.height * 0.13);
  const bottom = Math.round(o.height * 0.97);
  const depth = bottom - top;
  const cx = o.width / 2;
  if (o.footprint === "curvilinear") {
    // Virtual apex above the skin line; the top edge is the wide arc at radius `inner`.
    const inner = depth * 0.45;
    const outer = inner + depth;
    const half = Math.min((28 * Math.PI) / 180, Math.asin(Math.min(1, (o.width * 0.46) / outer)));
    return { top, bottom, depth, cx, apexY: top - inner, inner, outer, half };
  }
  if (o.footprint === "phased") {
    const half = Math.min((42 * Math.PI) / 180, Math.asin(Math.min(1, (o.width * 0.46) / depth)));
    return { top, bottom, depth, cx, apexY: top, inner: depth * 0.02, outer: depth, half };
  }
  return { top, bottom, depth, cx, apexY: 0, inner: 0, outer: 0, half: 0, left: Math.round(o.width * 0.2), right: Math.round(o.width * 0.8) };
}

/**
 * The static layer: 0 outside the footprint, 1 in used tissue, DEEP_FIELD in the unused deep
 * part, times the gain (clipped later by ffmpeg's multiply).
 */
function footprintMask(o: DemoImageOptions): Buffer {
  const g = geometry(o);
  const cut = g.bottom - (o.unusedDepth ?? 0) * g.depth;
  const out = Buffer.alloc(o.width * o.height);
  for (let y = 0; y < o.height; y++) {
    for (let x = 0; x < o.width; x++) {
      let inside: boolean;
      if (o.footprint === "linear") inside = y >= g.top && y < g.bottom && x >= g.left! && x < g.right!;
      else {
        const dx = x - g.cx;
        const dy = y - g.apexY;
        const r = Math.hypot(dx, dy);
        inside = dy > 0 && r >= g.inner && r <= g.outer && Math.abs(Math.atan2(dx, dy)) <= g.half;
      }
      if (inside) out[y * o.width + x] = y < cut ? 255 : Math.round(255 * DEEP_FIELD);
    }
  }
  return out;
}

/** The moving layer: Rayleigh-like speckle shaped by tissue layers and dark fluid ellipses. */
function tissueTexture(o: DemoImageOptions, w: number, h: number): Buffer {
  const rand = rng(o.seed ?? 7);
  const out = Buffer.alloc(w * h);
  const layers = Array.from({ length: 4 }, () => ({ y: rand() * h, bright: 0.25 + rand() * 0.2, thick: 2 + rand() * 5 }));
  const fluid =
    o.fluid === false
      ? []
      : Array.from({ length: 2 }, (_, i) => ({
          cx: w * (0.38 + 0.24 * i + (rand() - 0.5) * 0.06),
          cy: h * (0.35 + 0.2 * i + (rand() - 0.5) * 0.06),
          rx: w * (0.05 + rand() * 0.04),
          ry: h * (0.04 + rand() * 0.03),
        }));
  for (let y = 0; y < h; y++) {
    let rowGain = 0.62 - 0.12 * (y / h); // mild attenuation with depth
    for (const l of layers) rowGain += l.bright * Math.exp(-(((y - l.y) / l.thick) ** 2));
    for (let x = 0; x < w; x++) {
      let v = Math.sqrt(-2 * Math.log(1 - rand() * 0.999)) * 0.55; // Rayleigh, mean ≈ 0.69
      for (const f of fluid) {
        const d = ((x - f.cx) / f.rx) ** 2 + ((y - f.cy) / f.ry) ** 2;
        if (d < 1) v *= 0.05 + 0.1 * d * d; // anechoic centre, soft rim
      }
      out[y * w + x] = Math.min(255, Math.round(255 * v * rowGain));
    }
  }
  return out;
}

function fontFile(): string | null {
  return FONT_CANDIDATES.find((f) => existsSync(f)) ?? null;
}

/** Escapes a value for use inside a single-quoted filtergraph option. */
const filterQuote = (s: string) => `'${s.replace(/\\/g, "\\\\").replace(/'/g, "'\\''").replace(/:/g, "\\:")}'`;

/** Writes the two layers and returns the inputs and the filtergraph that combine them into grey video. */
async function layers(o: DemoImageOptions, dir: string, moving: boolean) {
  const texW = o.width + 2 * PAD;
  const texH = o.height + 2 * PAD;
  const maskPath = path.join(dir, "mask.png");
  const texPath = path.join(dir, "texture.png");
  const raw = (w: number, h: number) => ({ raw: { width: w, height: h, channels: 1 as const } });
  await Promise.all([
    sharp(footprintMask(o), raw(o.width, o.height)).png({ compressionLevel: 1 }).toFile(maskPath),
    sharp(tissueTexture(o, texW, texH), raw(texW, texH))
      .blur(0.6)
      .png({ compressionLevel: 1 })
      .toFile(texPath),
  ]);
  const gain = GAIN[o.gain ?? "balanced"];
  const drift = moving ? { x: `${PAD}+${PAD - 2}*sin(t*0.9)`, y: `${PAD}+${PAD - 2}*sin(t*0.6+1)` } : { x: String(PAD), y: String(PAD) };
  const font = fontFile();
  const label = o.label ?? "CEDAR HOLLOW  C5  12cm";
  const fs_ = Math.max(10, Math.round(o.height * 0.035));
  const text = font
    ? `drawtext=fontfile=${filterQuote(font)}:text=${filterQuote(label)}:fontcolor=0xd8d8d8:fontsize=${fs_}:x=${Math.round(o.width * 0.03)}:y=${Math.round(o.height * 0.02)}`
    : // No font on this machine: stand-in boxes where the text would be.
      Array.from(
        { length: 6 },
        (_, i) =>
          `drawbox=x=${Math.round(o.width * (0.03 + i * 0.05))}:y=${Math.round(o.height * 0.025)}:w=${Math.round(o.width * 0.035)}:h=${fs_}:color=0xd8d8d8:t=fill`,
      ).join(",");
  const graph = [
    `[0:v]crop=${o.width}:${o.height}:x='${drift.x}':y='${drift.y}',format=gray[tex]`,
    `[1:v]format=gray[mask]`,
    `[tex][mask]blend=all_mode=multiply,lut=c0='clip(val*${gain},0,255)',${text}[v]`,
  ].join(";");
  return { texPath, maskPath, graph };
}

const ENCODER: Record<NonNullable<DemoClipOptions["codec"]>, string[]> = {
  h264: ["-c:v", "libx264", "-preset", "veryfast", "-crf", "20"],
  hevc: ["-c:v", "libx265", "-preset", "ultrafast", "-x265-params", "log-level=error"],
  mpeg4: ["-c:v", "mpeg4", "-q:v", "3"],
  vp9: ["-c:v", "libvpx-vp9", "-deadline", "realtime", "-cpu-used", "8", "-b:v", "800k", "-row-mt", "1"],
};
const DEFAULT_CODEC: Record<NonNullable<DemoClipOptions["container"]>, NonNullable<DemoClipOptions["codec"]>> = {
  mp4: "h264",
  mov: "h264",
  mkv: "h264",
  avi: "mpeg4",
  webm: "vp9",
};
const AUDIO: Record<NonNullable<DemoClipOptions["container"]>, string[]> = {
  mp4: ["-c:a", "aac", "-b:a", "64k"],
  mov: ["-c:a", "aac", "-b:a", "64k"],
  mkv: ["-c:a", "aac", "-b:a", "64k"],
  avi: ["-c:a", "pcm_s16le"],
  webm: ["-c:a", "libopus", "-b:a", "48k"],
};
const MUXER = { mp4: "mp4", mov: "mov", mkv: "matroska", avi: "avi", webm: "webm" } as const;

/** Writes an invented ultrasound-like clip. */
export async function generateDemoClip(outPath: string, o: DemoClipOptions): Promise<void> {
  const dir = await fs.mkdtemp(path.join(os.tmpdir(), "soundings-gen-"));
  try {
    const { texPath, maskPath, graph } = await layers(o, dir, true);
    const container = o.container ?? "mp4";
    const codec = o.codec ?? DEFAULT_CODEC[container];
    const args = [
      "-framerate",
      String(o.fps),
      "-loop",
      "1",
      "-i",
      fileUrl(texPath),
      "-framerate",
      String(o.fps),
      "-loop",
      "1",
      "-i",
      fileUrl(maskPath),
      ...(o.audio ? ["-f", "lavfi", "-i", "sine=frequency=440:sample_rate=48000"] : []),
      "-filter_complex",
      `${graph};[v]format=${o.pixFmt ?? "yuv420p"}[out]`,
      "-map",
      "[out]",
      ...(o.audio ? ["-map", "2:a", ...AUDIO[container]] : []),
      ...ENCODER[codec],
      ...(o.keyframeEvery ? ["-force_key_frames", `expr:gte(t,n_forced*${o.keyframeEvery})`] : []),
      ...Object.entries(o.metadata ?? {}).flatMap(([k, v]) => ["-metadata", `${k}=${v}`]),
      "-t",
      String(o.seconds),
      "-r",
      String(o.fps),
      "-f",
      MUXER[container],
      "-y",
      fileUrl(outPath),
    ];
    await ffmpeg(args, "The demo clip could not be generated");
  } finally {
    await fs.rm(dir, { recursive: true, force: true });
  }
}

/** Writes an invented ultrasound-like still (JPEG or PNG, by the extension of outPath). */
export async function generateDemoStill(outPath: string, o: DemoImageOptions): Promise<void> {
  const dir = await fs.mkdtemp(path.join(os.tmpdir(), "soundings-gen-"));
  try {
    const { texPath, maskPath, graph } = await layers(o, dir, false);
    const frame = path.join(dir, "frame.png");
    await ffmpeg(
      ["-i", fileUrl(texPath), "-i", fileUrl(maskPath), "-filter_complex", graph, "-map", "[v]", "-frames:v", "1", "-update", "1", "-y", fileUrl(frame)],
      "The demo still could not be generated",
    );
    const img = sharp(frame);
    await (/\.png$/i.test(outPath) ? img.png() : img.jpeg({ quality: 92 })).toFile(outPath);
  } finally {
    await fs.rm(dir, { recursive: true, force: true });
  }
}
