// A DICOM clip's processing: its (already de-identified) object is decoded frame by frame,
// redaction boxes black out the frames and, with the Clean Pixel Data Option, the object's own
// pixels; the frames become the input of the usual video or still processing at the object's
// frame rate, and the object to keep is returned beside them.
import fsp from "node:fs/promises";
import path from "node:path";
import { cleanRedactions, type Redaction } from "../plan";
import { readDicom, type DicomFacts } from "./read";
import { markDeidentified } from "./deidentify";
import { decodeFrames, DEFAULT_FRAME_RATE, framesToClip, redactFrames, rewritePixelData } from "./frames";

export interface DicomMedia {
  kind: "video" | "still";
  /** The clip (MP4) or still (PNG) to process as any other upload, with no boxes left to apply. */
  media: string;
  /** The de-identified object to keep (pixels cleaned when there were boxes). */
  object: string;
  facts: DicomFacts;
  cleanedPixels: boolean;
}

export async function prepareDicom(input: string, work: string, opts: { redactions?: readonly Redaction[] } = {}): Promise<DicomMedia> {
  const read = readDicom(await fsp.readFile(input));
  const frames = await decodeFrames(input, path.join(work, "frames"), read.facts.frames);
  const boxes = cleanRedactions(opts.redactions);
  let object = input;
  if (boxes.length) {
    const { grey } = await redactFrames(frames, boxes);
    await rewritePixelData(read.file, frames, grey);
    markDeidentified(read.file, true);
    object = path.join(work, "object.dcm");
    await fsp.writeFile(object, Buffer.from(read.file.write()));
  }
  if (frames.length === 1) return { kind: "still", media: frames[0], object, facts: read.facts, cleanedPixels: boxes.length > 0 };
  const clip = path.join(work, "dicom-frames.mp4");
  await framesToClip(frames, read.facts.frameRate ?? DEFAULT_FRAME_RATE, clip);
  return { kind: "video", media: clip, object, facts: read.facts, cleanedPixels: boxes.length > 0 };
}
