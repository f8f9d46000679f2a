// Says what an uploaded file is from its content (never its name): an accepted video or still,
// or, for anything else, a short description of what was found so the API can answer 415.
import fs from "node:fs/promises";
import { fileTypeFromFile } from "file-type";

export type Detected =
  | { kind: "video"; mime: string; container: "mp4" | "mov" | "m4v" | "avi" | "webm" | "mkv" }
  | { kind: "still"; mime: string; container: "jpeg" | "png" }
  | { kind: "dicom"; mime: "application/dicom"; container: "dicom" }
  | { kind: null; found: string };

const VIDEO: Record<string, "mp4" | "mov" | "m4v" | "avi" | "webm" | "mkv"> = {
  mp4: "mp4",
  mov: "mov",
  m4v: "m4v",
  avi: "avi",
  webm: "webm",
  mkv: "mkv",
};

/** Plain words for common things people upload by mistake. */
const FOUND: Record<string, string> = {
  pdf: "PDF document",
  gif: "GIF image",
  webp: "WebP image",
  heic: "HEIC image",
  avif: "AVIF image",
  tif: "TIFF image",
  bmp: "BMP image",
  zip: "ZIP archive",
  gz: "gzip archive",
  "7z": "7-Zip archive",
  rar: "RAR archive",
  docx: "Word document",
  xlsx: "Excel workbook",
  pptx: "PowerPoint presentation",
  mp3: "MP3 audio",
  m4a: "M4A audio",
  wav: "WAV audio",
  "3gp": "3GP video (not supported)",
  flv: "Flash video (not supported)",
  mpg: "MPEG program stream video (not supported)",
  mts: "MPEG transport stream video (not supported)",
  exe: "Windows program",
  elf: "Linux program",
};

/** True when the bytes read as text: valid UTF-8 with no NULs and hardly any control characters. */
export function looksLikeText(buf: Buffer): boolean {
  if (buf.length === 0 || buf.includes(0)) return false;
  // A multi-byte character cut at the end of the sample is not a reason to say "binary".
  let sample = buf;
  for (let cut = 0; cut < 4; cut++) {
    try {
      new TextDecoder("utf-8", { fatal: true }).decode(sample);
      break;
    } catch {
      if (cut === 3) return false;
      sample = sample.subarray(0, sample.length - 1);
    }
  }
  let control = 0;
  for (const b of sample) if (b < 32 && b !== 9 && b !== 10 && b !== 13 && b !== 12) control++;
  return control / sample.length < 0.01;
}

const DICOM = { kind: "dicom", mime: "application/dicom", container: "dicom" } as const;

/** What a file is, from its first bytes. */
export async function detectMedia(filePath: string): Promise<Detected> {
  const fh = await fs.open(filePath, "r");
  let head: Buffer;
  let size: number;
  try {
    size = (await fh.stat()).size;
    head = Buffer.alloc(Math.min(size, 8192));
    await fh.read(head, 0, head.length, 0);
  } finally {
    await fh.close();
  }
  if (size === 0) return { kind: null, found: "empty file" };
  // DICOM Part 10: a 128-byte preamble, then "DICM".
  if (head.length >= 132 && head.toString("latin1", 128, 132) === "DICM") return DICOM;
  const ft = await fileTypeFromFile(filePath);
  if (ft) {
    if (ft.ext in VIDEO) return { kind: "video", mime: ft.mime, container: VIDEO[ft.ext] };
    if (ft.ext === "jpg") return { kind: "still", mime: ft.mime, container: "jpeg" };
    if (ft.ext === "png") return { kind: "still", mime: ft.mime, container: "png" };
    if (ft.ext === "dcm") return DICOM;
    return { kind: null, found: FOUND[ft.ext] ?? `${ft.ext.toUpperCase()} file (${ft.mime})` };
  }
  if (looksLikeText(head)) return { kind: null, found: "plain text" };
  return { kind: null, found: "unknown binary data" };
}
