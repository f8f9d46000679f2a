// In-place clean-up of one field ffmpeg cannot be told to leave empty: the 32-byte
// "compressorname" of MP4 video sample entries, which ffmpeg fills from the stream's "encoder"
// tag ("Lavc libx264") on every stream it encodes (`-metadata encoder=` cannot delete that tag).
// Rewriting those bytes keeps the file's size and every offset, so no remux pass is needed.
import fs from "node:fs/promises";

const CONTAINERS = new Set(["moov", "trak", "mdia", "minf", "stbl"]);
/** Video sample entry types whose layout is ISO/IEC 14496-12 VisualSampleEntry. */
const VISUAL = new Set(["avc1", "avc3", "hvc1", "hev1", "mp4v", "vp09", "av01"]);
/** Offset of compressorname inside a VisualSampleEntry (box header included), and its length. */
const NAME_OFFSET = 8 + 6 + 2 + 2 + 2 + 12 + 2 + 2 + 4 + 4 + 4 + 2;
const NAME_LENGTH = 32;

interface Box {
  type: string;
  start: number;
  header: number;
  end: number;
}

function* boxes(buf: Buffer, from: number, to: number): Generator<Box> {
  let p = from;
  while (p + 8 <= to) {
    let size = buf.readUInt32BE(p);
    const type = buf.toString("latin1", p + 4, p + 8);
    let header = 8;
    if (size === 1) {
      if (p + 16 > to) return;
      size = Number(buf.readBigUInt64BE(p + 8));
      header = 16;
    } else if (size === 0) size = to - p;
    if (size < header || p + size > to) return;
    yield { type, start: p, header, end: p + size };
    p += size;
  }
}

/** Zeroes compressorname in every video sample entry of a moov box; returns how many were cleared. */
export function clearCompressorNamesInMoov(moov: Buffer): number {
  let cleared = 0;
  const walk = (from: number, to: number) => {
    for (const b of boxes(moov, from, to)) {
      if (CONTAINERS.has(b.type)) walk(b.start + b.header, b.end);
      else if (b.type === "stsd") {
        // FullBox header (4) + entry_count (4), then the sample entries.
        for (const e of boxes(moov, b.start + b.header + 8, b.end)) {
          if (VISUAL.has(e.type) && e.start + NAME_OFFSET + NAME_LENGTH <= e.end) {
            moov.fill(0, e.start + NAME_OFFSET, e.start + NAME_OFFSET + NAME_LENGTH);
            cleared++;
          }
        }
      }
    }
  };
  const top = boxes(moov, 0, moov.length).next().value;
  if (top?.type === "moov") walk(top.start + top.header, top.end);
  return cleared;
}

/** Finds the moov box of an MP4 file and clears the compressor names in place. */
export async function clearCompressorNames(file: string): Promise<number> {
  const fh = await fs.open(file, "r+");
  try {
    const size = (await fh.stat()).size;
    const head = Buffer.alloc(16);
    let p = 0;
    while (p + 8 <= size) {
      await fh.read(head, 0, 16, p);
      let boxSize = head.readUInt32BE(0);
      const type = head.toString("latin1", 4, 8);
      if (boxSize === 1) boxSize = Number(head.readBigUInt64BE(8));
      else if (boxSize === 0) boxSize = size - p;
      if (boxSize < 8) break;
      if (type === "moov") {
        const moov = Buffer.alloc(boxSize);
        await fh.read(moov, 0, boxSize, p);
        const n = clearCompressorNamesInMoov(moov);
        if (n > 0) await fh.write(moov, 0, boxSize, p);
        return n;
      }
      p += boxSize;
    }
    return 0;
  } finally {
    await fh.close();
  }
}
