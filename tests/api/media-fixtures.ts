// Small media files made on the spot with Debian's ffmpeg and sharp: test inputs only,
// synthetic patterns (no patient images).
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import sharp from "sharp";

export const fixtureDir = () => fs.mkdtempSync(path.join(os.tmpdir(), "soundings-fixture-"));

const ffmpeg = (args: string[]) => execFileSync("ffmpeg", ["-hide_banner", "-loglevel", "error", "-y", ...args]);

/** An H.264 MP4 with an audio track and identifying metadata; `seed` changes the pixels. */
export function h264Mp4(dir: string, name = "clip.mp4", opts: { seconds?: number; size?: string; seed?: number } = {}): string {
  const out = path.join(dir, name);
  ffmpeg([
    "-f",
    "lavfi",
    "-i",
    `testsrc2=size=${opts.size ?? "320x240"}:rate=15:duration=${opts.seconds ?? 1}`,
    "-f",
    "lavfi",
    "-i",
    `sine=frequency=${440 + (opts.seed ?? 0)}:duration=${opts.seconds ?? 1}`,
    "-vf",
    `drawbox=x=${(opts.seed ?? 0) % 200}:y=10:w=20:h=20:color=white:t=fill`,
    "-c:v",
    "libx264",
    "-preset",
    "ultrafast",
    "-pix_fmt",
    "yuv420p",
    "-c:a",
    "aac",
    "-shortest",
    "-metadata",
    "title=Patient Example",
    "-metadata",
    "comment=MRN 000000",
    out,
  ]);
  return out;
}

/** An MPEG-4 Part 2 AVI (needs transcoding), big enough to take a few seconds. */
export function mpeg4Avi(dir: string, name = "clip.avi", opts: { seconds?: number; size?: string } = {}): string {
  const out = path.join(dir, name);
  ffmpeg(["-f", "lavfi", "-i", `testsrc2=size=${opts.size ?? "320x240"}:rate=25:duration=${opts.seconds ?? 1}`, "-c:v", "mpeg4", "-q:v", "5", out]);
  return out;
}

/** The first `keep` share of a valid MP4: a broken file that still starts like an MP4. */
export function truncatedMp4(dir: string): string {
  const full = h264Mp4(dir, "full-for-truncation.mp4", { seconds: 2 });
  const bytes = fs.readFileSync(full);
  const out = path.join(dir, "truncated.mp4");
  fs.writeFileSync(out, bytes.subarray(0, Math.floor(bytes.length * 0.3)));
  return out;
}

export async function png(dir: string, name = "still.png", seed = 0): Promise<string> {
  const out = path.join(dir, name);
  await sharp({ create: { width: 200, height: 150, channels: 3, background: { r: 40 + seed, g: 40, b: 40 } } })
    .composite([{ input: Buffer.from(`<svg width="200" height="150"><rect x="60" y="50" width="80" height="50" fill="#ccc"/></svg>`) }])
    .png()
    .toFile(out);
  return out;
}

export function textFile(dir: string, name = "notes.mp4"): string {
  const out = path.join(dir, name);
  fs.writeFileSync(out, "This is not a video, only some words.\n".repeat(20));
  return out;
}
