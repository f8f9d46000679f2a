// The frames of a DICOM image: decoded by DCMTK's dcmj2pnm (uncompressed, RLE and JPEG
// transfer syntaxes; colour models and palettes as DCMTK renders them) to one PNG per frame,
// blacked out under redaction boxes when there are any, and assembled by ffmpeg into an H.264
// clip at the object's own frame rate, or kept as a still for a single frame. With redaction
// boxes the object's pixel data is rewritten from the cleaned frames (uncompressed 8-bit), so the
// kept DICOM carries no pixels under a box (the Clean Pixel Data Option), not a cover over them.
import fsp from "node:fs/promises";
import path from "node:path";
import sharp from "sharp";
import { ffmpeg, fileUrl, MediaError, runTool, trimReason } from "../exec";
import { redactionPixels } from "../plan";
import type { Redaction } from "../plan";
import type { DicomDict } from "./read";

export const DCMJ2PNM = process.env.DCMJ2PNM_PATH ?? "dcmj2pnm";
/** Frame rate used when the object states none. */
export const DEFAULT_FRAME_RATE = 30;

/** Decodes every frame of a DICOM file to PNGs in `dir`; returns their paths in order. */
export async function decodeFrames(dicomPath: string, dir: string, frames: number): Promise<string[]> {
  await fsp.mkdir(dir, { recursive: true });
  const prefix = path.join(dir, "frame");
  try {
    await runTool(DCMJ2PNM, ["+Fa", "+on", "--no-overlays", dicomPath, prefix], { timeoutSeconds: 60 + frames });
  } catch (err) {
    const e = err as NodeJS.ErrnoException & { stderrText?: string; timedOutAfter?: number };
    if (e.code === "ENOENT") throw new MediaError("dcmj2pnm (DCMTK) is not installed on this server");
    if (e.timedOutAfter !== undefined) throw new MediaError(`Decoding the DICOM frames took longer than ${e.timedOutAfter} s and was stopped`);
    throw new MediaError(`The DICOM frames could not be decoded: ${trimReason(e.stderrText ?? e.message)}`);
  }
  const out = Array.from({ length: frames }, (_, i) => `${prefix}.${i}.png`);
  // A single frame is written without the index when only one exists.
  if (frames === 1) {
    const names = await fsp.readdir(dir);
    const only = names.find((n) => n.startsWith("frame") && n.endsWith(".png"));
    if (only && only !== "frame.0.png") await fsp.rename(path.join(dir, only), out[0]);
  }
  for (const f of out) await fsp.access(f).catch(() => Promise.reject(new MediaError("The DICOM file holds fewer frames than it says")));
  return out;
}

/**
 * A preview of a DICOM object: its middle frame (1-based for dcmj2pnm's --frame), decoded alone
 * and written as a JPEG at most 480 pixels wide. The object given must already be de-identified;
 * the preview shows what its pixels show.
 */
export async function previewFrame(dicomPath: string, dir: string, frames: number, out: string): Promise<void> {
  await fsp.mkdir(dir, { recursive: true });
  const png = path.join(dir, "preview.png");
  const frame = Math.max(1, Math.ceil(frames / 2));
  try {
    await runTool(DCMJ2PNM, ["--frame", String(frame), "+on", "--no-overlays", dicomPath, png], { timeoutSeconds: 60 });
  } catch (err) {
    const e = err as NodeJS.ErrnoException & { stderrText?: string };
    if (e.code === "ENOENT") throw new MediaError("dcmj2pnm (DCMTK) is not installed on this server");
    throw new MediaError(`The DICOM frames could not be decoded: ${trimReason(e.stderrText ?? e.message)}`);
  }
  await sharp(await fsp.readFile(png))
    .resize({ width: 480, withoutEnlargement: true })
    .jpeg({ quality: 80 })
    .toFile(out);
}

/** Blacks out the boxes in every frame (in place); returns the frames' size and whether they are grey. */
export async function redactFrames(files: string[], boxes: readonly Redaction[]): Promise<{ width: number; height: number; grey: boolean }> {
  const meta = await sharp(await fsp.readFile(files[0])).metadata();
  const width = meta.width ?? 0;
  const height = meta.height ?? 0;
  const grey = (meta.channels ?? 3) < 3;
  const rects = redactionPixels(boxes, width, height).filter((b) => b.w > 0 && b.h > 0);
  if (rects.length)
    for (const f of files) {
      const black = rects.map((r) => ({
        input: { create: { width: r.w, height: r.h, channels: 3 as const, background: { r: 0, g: 0, b: 0 } } },
        left: r.x,
        top: r.y,
      }));
      const buf = await sharp(await fsp.readFile(f))
        .composite(black)
        .png()
        .toBuffer();
      await fsp.writeFile(f, buf);
    }
  return { width, height, grey };
}

/**
 * Replaces the object's pixel data with the given frames as uncompressed 8-bit pixels (RGB, or
 * MONOCHROME2 when the frames are grey) and switches it to Explicit VR Little Endian.
 */
export async function rewritePixelData(file: DicomDict, frames: string[], grey: boolean): Promise<void> {
  const parts: Buffer[] = [];
  let width = 0;
  let height = 0;
  for (const f of frames) {
    // From the bytes, not the path: libvips caches files by name, and the frames were just rewritten.
    const img = sharp(await fsp.readFile(f)).removeAlpha();
    const { data, info } = await (grey ? img.greyscale().toColourspace("b-w") : img.toColourspace("srgb")).raw().toBuffer({ resolveWithObject: true });
    width = info.width;
    height = info.height;
    parts.push(grey && info.channels !== 1 ? Buffer.from(data.filter((_, i) => i % info.channels === 0)) : data);
  }
  let all = Buffer.concat(parts);
  if (all.length % 2) all = Buffer.concat([all, Buffer.alloc(1)]);
  const d = file.dict;
  const set = (tag: string, vr: string, value: unknown[]) => (d[tag] = { vr, Value: value });
  set("00280002", "US", [grey ? 1 : 3]);
  set("00280004", "CS", [grey ? "MONOCHROME2" : "RGB"]);
  if (!grey) set("00280006", "US", [0]);
  else delete d["00280006"];
  set("00280010", "US", [height]);
  set("00280011", "US", [width]);
  set("00280100", "US", [8]);
  set("00280101", "US", [8]);
  set("00280102", "US", [7]);
  set("00280103", "US", [0]);
  for (const t of ["00281101", "00281102", "00281103", "00281201", "00281202", "00281203", "00282110", "00282112", "00282114"]) delete d[t];
  set("7FE00010", "OB", [all.buffer.slice(all.byteOffset, all.byteOffset + all.byteLength)]);
  file.meta["00020010"] = { vr: "UI", Value: ["1.2.840.10008.1.2.1"] };
}

/** Assembles the frames into an H.264 MP4 at `fps` (a near-lossless intermediate the video pipeline then takes). */
export async function framesToClip(frames: string[], fps: number, out: string): Promise<void> {
  const pattern = frames[0].replace(/\.0\.png$/, ".%d.png");
  await ffmpeg(
    [
      "-framerate",
      String(fps),
      "-start_number",
      "0",
      "-i",
      fileUrl(pattern),
      "-frames:v",
      String(frames.length),
      "-vf",
      "pad=ceil(iw/2)*2:ceil(ih/2)*2",
      "-c:v",
      "libx264",
      "-preset",
      "veryfast",
      "-crf",
      "12",
      "-pix_fmt",
      "yuv420p",
      "-an",
      fileUrl(out),
    ],
    "The DICOM frames could not be made into a clip",
  );
}
