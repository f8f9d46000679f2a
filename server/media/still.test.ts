// Stills and content detection, checked with sharp's metadata reader, byte searches of the
// outputs and file-type's own reading of inputs.
import fs from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { generateDemoClip, generateDemoStill } from "../../seeds/clips/generate";
import { detectMedia } from "./detect";
import { processStill } from "./still";

let dir: string;
const f = (name: string) => path.join(dir, name);

/** CRC-32 as PNG defines it (kept here so the test does not depend on the code under test). */
function crc32(buf: Buffer): number {
  let c = ~0;
  for (const b of buf) {
    c ^= b;
    for (let k = 0; k < 8; k++) c = (c >>> 1) ^ (0xedb88320 & -(c & 1));
  }
  return ~c >>> 0;
}

/** Inserts a tEXt chunk right after IHDR. */
function withPngText(png: Buffer, key: string, text: string): Buffer {
  const body = Buffer.concat([Buffer.from("tEXt"), Buffer.from(key, "latin1"), Buffer.from([0]), Buffer.from(text, "latin1")]);
  const chunk = Buffer.alloc(body.length + 8);
  chunk.writeUInt32BE(body.length - 4, 0);
  body.copy(chunk, 4);
  chunk.writeUInt32BE(crc32(body), body.length + 4);
  const ihdrEnd = 8 + 8 + 13 + 4;
  return Buffer.concat([png.subarray(0, ihdrEnd), chunk, png.subarray(ihdrEnd)]);
}

beforeAll(async () => {
  dir = await fs.mkdtemp(path.join(os.tmpdir(), "soundings-still-test-"));
  await generateDemoStill(f("plain.png"), { footprint: "linear", width: 200, height: 150 });
  const png = await fs.readFile(f("plain.png"));
  await fs.writeFile(f("text.png"), withPngText(png, "Comment", "Patient name Example"));
  await sharp(png)
    .jpeg()
    .withMetadata({ exif: { IFD0: { Copyright: "x", ImageDescription: "Patient name Example" } } })
    .toFile(f("exif.jpg"));
  // Orientation 6: stored landscape, shown rotated 90° clockwise.
  await sharp(png).jpeg().withMetadata({ orientation: 6 }).toFile(f("rotated.jpg"));
  await sharp(png).gif().toFile(f("anim.gif"));
  await fs.writeFile(f("notes.mp4"), "These are my scan notes.\nNot a video at all.\n");
  await fs.writeFile(f("empty.mp4"), "");
  await fs.writeFile(f("doc.pdf"), "%PDF-1.4\n1 0 obj << /Type /Catalog >> endobj\ntrailer << >>\n%%EOF\n");
  await fs.writeFile(f("scan.dcm"), Buffer.concat([Buffer.alloc(128), Buffer.from("DICM"), Buffer.alloc(64, 1)]));
  await fs.writeFile(f("noise.bin"), Buffer.from(Array.from({ length: 512 }, (_, i) => (i * 97 + 13) % 256)));
  await Promise.all([
    generateDemoClip(f("clip.webm"), { footprint: "phased", seconds: 0.5, fps: 10, width: 160, height: 120, container: "webm" }),
    generateDemoClip(f("clip.mp4"), { footprint: "phased", seconds: 0.5, fps: 10, width: 160, height: 120, container: "mp4" }),
    generateDemoClip(f("clip.avi"), { footprint: "phased", seconds: 0.5, fps: 10, width: 160, height: 120, container: "avi" }),
  ]);
}, 60_000);

afterAll(async () => {
  if (dir) await fs.rm(dir, { recursive: true, force: true });
});

describe("processStill", () => {
  it("starts from inputs that really carry the text and EXIF", async () => {
    expect((await sharp(f("exif.jpg")).metadata()).exif).toBeDefined();
    expect((await fs.readFile(f("exif.jpg"))).includes("Patient name")).toBe(true);
    expect((await fs.readFile(f("text.png"))).includes("tEXtComment")).toBe(true);
    expect((await sharp(f("text.png")).metadata()).comments?.[0]?.text).toBe("Patient name Example");
  });

  it("re-encodes a JPEG without EXIF", async () => {
    const out = await processStill(f("exif.jpg"), f("out-jpg"));
    const meta = await sharp(out.imagePath).metadata();
    expect(meta.format).toBe("jpeg");
    expect(meta.exif).toBeUndefined();
    expect(meta.xmp).toBeUndefined();
    const bytes = await fs.readFile(out.imagePath);
    expect(bytes.includes("Patient name")).toBe(false);
    expect(bytes.includes("Exif")).toBe(false);
    expect([out.width, out.height]).toEqual([200, 150]);
  });

  it("re-encodes a PNG without text chunks", async () => {
    const out = await processStill(f("text.png"), f("out-png"));
    const meta = await sharp(out.imagePath).metadata();
    expect(meta.format).toBe("png");
    expect(meta.comments ?? []).toEqual([]);
    const bytes = await fs.readFile(out.imagePath);
    for (const needle of ["Patient name", "tEXt", "zTXt", "iTXt", "eXIf"]) expect(bytes.includes(needle), needle).toBe(false);
  });

  it("applies the EXIF orientation, then drops it", async () => {
    const out = await processStill(f("rotated.jpg"), f("out-rot"));
    const meta = await sharp(out.imagePath).metadata();
    expect([meta.width, meta.height]).toEqual([150, 200]);
    expect(meta.orientation).toBeUndefined();
  });

  it("paints redaction boxes black and makes a 320 px JPEG thumbnail", async () => {
    const box = { x: 0.1, y: 0.2, w: 0.5, h: 0.3 };
    const out = await processStill(f("plain.png"), f("out-redact"), { redactions: [box] });
    const { data, info } = await sharp(out.imagePath).raw().toBuffer({ resolveWithObject: true });
    let maxIn = 0;
    let sumIn = 0;
    for (let y = 0; y < info.height; y++)
      for (let x = 0; x < info.width; x++) {
        const v = data[(y * info.width + x) * info.channels];
        if (x >= box.x * info.width && x < (box.x + box.w) * info.width && y >= box.y * info.height && y < (box.y + box.h) * info.height)
          maxIn = Math.max(maxIn, v);
      }
    const { data: before } = await sharp(f("plain.png")).raw().toBuffer({ resolveWithObject: true });
    for (let y = 40; y < 70; y++) for (let x = 30; x < 110; x++) sumIn += before[(y * info.width + x) * info.channels];
    expect(sumIn).toBeGreaterThan(0); // the picture was not black there to start with
    expect(maxIn).toBe(0);
    const thumb = await sharp(out.thumbPath).metadata();
    expect(thumb.format).toBe("jpeg");
    expect(thumb.width).toBe(320);
  });

  it("refuses a 16000×16000 PNG from its header, before decoding it", async () => {
    // Small on disk (one flat colour compresses well), 256 megapixels when decoded.
    const bomb = f("bomb.png");
    await sharp({ create: { width: 16000, height: 16000, channels: 3, background: "#000" } })
      .png({ compressionLevel: 9 })
      .toFile(bomb);
    expect((await fs.stat(bomb)).size).toBeLessThan(2 * 1024 * 1024);
    await expect(processStill(bomb, f("out-bomb"))).rejects.toThrow("The image is 16000×16000 pixels; the limit is 50 megapixels");
    await expect(fs.readdir(f("out-bomb")).catch(() => [])).resolves.toEqual([]);
  }, 60_000);

  it("refuses a JPEG whose header claims 60000×60000 pixels", async () => {
    // The frame header (SOF0/SOF2: FFC0/FFC2, length, precision, height, width; ITU-T T.81 B.2.2) rewritten.
    const jpeg = await sharp(f("plain.png")).jpeg().toBuffer();
    let sof = -1;
    for (let i = 2; i < jpeg.length - 9 && sof < 0; i++) if (jpeg[i] === 0xff && (jpeg[i + 1] === 0xc0 || jpeg[i + 1] === 0xc2)) sof = i;
    expect(sof).toBeGreaterThan(0);
    jpeg.writeUInt16BE(60000, sof + 5);
    jpeg.writeUInt16BE(60000, sof + 7);
    await fs.writeFile(f("bomb.jpg"), jpeg);
    expect((await sharp(f("bomb.jpg"), { limitInputPixels: false }).metadata()).width).toBe(60000);
    await expect(processStill(f("bomb.jpg"), f("out-bomb-jpg"))).rejects.toThrow("The image is 60000×60000 pixels; the limit is 50 megapixels");
  });

  it("fits the thumbnail of a tall, thin still inside 320×960 (not 320 wide and 1.28 million high)", async () => {
    await sharp({ create: { width: 1, height: 4000, channels: 3, background: "#888" } })
      .png()
      .toFile(f("thin.png"));
    const out = await processStill(f("thin.png"), f("out-thin"));
    const thumb = await sharp(out.thumbPath).metadata();
    expect(thumb.height).toBe(960);
    expect(thumb.width).toBe(1);
    expect([out.width, out.height]).toEqual([1, 4000]);
  });

  it("refuses a file that is not an image with a readable error", async () => {
    await expect(processStill(f("notes.mp4"), f("out-bad"))).rejects.toThrow(/could not be read as an image/);
  });
});

describe("detectMedia", () => {
  it("reads the content, not the name", async () => {
    expect(await detectMedia(f("notes.mp4"))).toEqual({ kind: null, found: "plain text" });
    expect(await detectMedia(f("empty.mp4"))).toEqual({ kind: null, found: "empty file" });
  });
  it("recognises accepted videos and stills", async () => {
    expect(await detectMedia(f("plain.png"))).toEqual({ kind: "still", mime: "image/png", container: "png" });
    expect(await detectMedia(f("exif.jpg"))).toEqual({ kind: "still", mime: "image/jpeg", container: "jpeg" });
    expect(await detectMedia(f("clip.webm"))).toMatchObject({ kind: "video", container: "webm" });
    expect(await detectMedia(f("clip.mp4"))).toMatchObject({ kind: "video", mime: "video/mp4", container: "mp4" });
    expect(await detectMedia(f("clip.avi"))).toMatchObject({ kind: "video", container: "avi" });
    // DICOM by its preamble (PS3.10 7.1: 128 bytes, then "DICM"), whatever the name.
    expect(await detectMedia(f("scan.dcm"))).toEqual({ kind: "dicom", mime: "application/dicom", container: "dicom" });
  });
  it("names what it found otherwise", async () => {
    expect(await detectMedia(f("doc.pdf"))).toEqual({ kind: null, found: "PDF document" });
    expect(await detectMedia(f("anim.gif"))).toEqual({ kind: null, found: "GIF image" });
    expect(await detectMedia(f("noise.bin"))).toEqual({ kind: null, found: "unknown binary data" });
  });
});
