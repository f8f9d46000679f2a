// Re-encodes an uploaded still (JPEG or PNG) through sharp: orientation applied, every metadata
// block (EXIF, XMP, ICC, PNG text chunks) left behind, redaction boxes painted black, a thumbnail.
import fs from "node:fs/promises";
import path from "node:path";
import sharp, { type OutputInfo } from "sharp";
import { MediaError, trimReason } from "./exec";
import { imageSizeProblem, MAX_PIXELS } from "./limits";
import { redactionPixels, type Redaction } from "./plan";

export interface ProcessedStill {
  imagePath: string;
  thumbPath: string;
  width: number;
  height: number;
}

export const THUMB_WIDTH = 320;
/** A thumbnail's most height: a tall, thin still is fitted inside 320×960 instead of stretched to 320 wide. */
export const THUMB_MAX_HEIGHT = 960;

/** sharp's own cap on decoded pixels, in case a header understates what the decoder meets. */
const SHARP_INPUT = { limitInputPixels: MAX_PIXELS } as const;

/** Paints the boxes black in a raw interleaved 8-bit buffer (alpha, when present, made opaque). */
export function paintBlack(data: Buffer, width: number, height: number, channels: number, hasAlpha: boolean, boxes: readonly Redaction[]): void {
  const colour = hasAlpha ? channels - 1 : channels;
  for (const b of redactionPixels(boxes, width, height)) {
    for (let y = b.y; y < b.y + b.h; y++) {
      for (let x = b.x; x < b.x + b.w; x++) {
        const o = (y * width + x) * channels;
        data.fill(0, o, o + colour);
        if (hasAlpha) data[o + colour] = 255;
      }
    }
  }
}

/** Processes one still into outDir (image.jpg or image.png, thumb.jpg). Throws MediaError when unreadable. */
export async function processStill(input: string, outDir: string, opts: { redactions?: Redaction[] } = {}): Promise<ProcessedStill> {
  let format: string | undefined;
  let decoded: { data: Buffer; info: OutputInfo };
  try {
    // The header first (metadata() decodes no pixels; its own pixel check is off so that the
    // refusal below can name the size): a small file can declare a frame of gigabytes.
    const meta = await sharp(input, { limitInputPixels: false }).metadata();
    format = meta.format;
    if (format !== "jpeg" && format !== "png") throw new MediaError(`The image is ${format ?? "of an unknown kind"}, not JPEG or PNG`);
    const tooBig = imageSizeProblem(meta.width ?? 0, meta.height ?? 0);
    if (tooBig) throw new MediaError(tooBig);
    // .rotate() with no angle applies the EXIF orientation; decoding to raw leaves all metadata behind.
    decoded = await sharp(input, SHARP_INPUT).rotate().raw({ depth: "uchar" }).toBuffer({ resolveWithObject: true });
  } catch (err) {
    if (err instanceof MediaError) throw err;
    // libvips reports one line per problem; keep the last distinct few on one line.
    throw new MediaError(`The file could not be read as an image: ${trimReason((err as Error).message)}`);
  }
  const { data, info } = decoded;
  paintBlack(data, info.width, info.height, info.channels, info.channels === 2 || info.channels === 4, opts.redactions ?? []);
  await fs.mkdir(outDir, { recursive: true });
  const raw = { width: info.width, height: info.height, channels: info.channels };
  const imagePath = path.join(outDir, format === "png" ? "image.png" : "image.jpg");
  const thumbPath = path.join(outDir, "thumb.jpg");
  try {
    const img = sharp(data, { raw });
    await (format === "png" ? img.png() : img.jpeg({ quality: 90 })).toFile(imagePath);
    await sharp(data, { raw })
      .resize({ width: THUMB_WIDTH, height: THUMB_MAX_HEIGHT, fit: "inside" })
      .flatten({ background: "#000" })
      .jpeg({ quality: 80 })
      .toFile(thumbPath);
  } catch (err) {
    await Promise.all([imagePath, thumbPath].map((f) => fs.rm(f, { force: true })));
    throw err;
  }
  return { imagePath, thumbPath, width: info.width, height: info.height };
}
