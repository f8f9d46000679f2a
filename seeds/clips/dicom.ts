// Invented DICOM objects for the demo and the tests: an Ultrasound Multi-frame Image (8-bit
// grey, explicit VR little endian) built with dcmjs, with the attributes a bedside machine
// writes — patient identity, operator, institution, a private group, Burned In Annotation YES,
// and a Sequence of Ultrasound Regions whose 2D tissue region carries the depth calibration
// (Physical Delta Y in cm per pixel over the region's rows) and the transducer frequency.
// Every value is invented; the pixels come from the demo clip generator or the caller.
import crypto from "node:crypto";
import fs from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import dcmjs from "dcmjs";
import { ffmpeg, fileUrl } from "../../server/media/exec";
import { generateDemoClip, type DemoImageOptions } from "./generate";

// dcmjs warns about the private group it writes; that group is there on purpose.
dcmjs.log.setLevel("error");

export const US_MULTIFRAME = "1.2.840.10008.5.1.4.1.1.3.1";
/** The invented machine's Implementation Class UID (a fixed UUID under 2.25). */
const IMPLEMENTATION = `2.25.${BigInt("0x5d1c0c4e7a2b4f3a9e61b0c2d4f6a8e0")}`;

export interface UsObjectOptions {
  width: number;
  height: number;
  frames: number;
  /** width × height × frames bytes, frame after frame. */
  pixels: Buffer;
  frameTimeMs: number;
  /** Imaging depth the region calibration gives (rows × Physical Delta Y). */
  depthCm: number;
  frequencyMHz: number;
  transducerType: "CURVED LINEAR" | "LINEAR" | "SECTOR_PHASED";
  studyUid: string;
  sopUid: string;
  studyDate: string;
  patient: { name: string; id: string; birthDate: string; sex: "F" | "M" | "O" };
  operator: string;
  institution: string;
  accession: string;
  referringPhysician: string;
  privateText: string;
}

const el = (vr: string, ...Value: unknown[]) => ({ vr, Value });

/** A fresh UID derived from a random UUID (DICOM PS3.5 B.2: the 2.25 arc), so it clashes with no one's. */
export const demoUid = () => `2.25.${BigInt(`0x${crypto.randomUUID().replace(/-/g, "")}`)}`;

/** The bytes of one US multi-frame object (Part 10 file with meta header). */
export function usObject(o: UsObjectOptions): Buffer {
  const meta = {
    "00020001": { vr: "OB", Value: [new Uint8Array([0, 1]).buffer] },
    "00020002": el("UI", US_MULTIFRAME),
    "00020003": el("UI", o.sopUid),
    "00020010": el("UI", "1.2.840.10008.1.2.1"),
    "00020012": el("UI", IMPLEMENTATION),
  };
  const dict: Record<string, unknown> = {
    "00080008": el("CS", "ORIGINAL", "PRIMARY"),
    "00080016": el("UI", US_MULTIFRAME),
    "00080018": el("UI", o.sopUid),
    "00080020": el("DA", o.studyDate),
    "00080030": el("TM", "101500"),
    "00080050": el("SH", o.accession),
    "00080060": el("CS", "US"),
    "00080080": el("LO", o.institution),
    "00080090": el("PN", { Alphabetic: o.referringPhysician }),
    "00081070": el("PN", { Alphabetic: o.operator }),
    "00100010": el("PN", { Alphabetic: o.patient.name }),
    "00100020": el("LO", o.patient.id),
    "00100030": el("DA", o.patient.birthDate),
    "00100040": el("CS", o.patient.sex),
    "00090010": el("LO", "INVENTED PRIVATE CREATOR"),
    "00091001": el("LO", o.privateText),
    "00181063": el("DS", o.frameTimeMs),
    "00186011": {
      vr: "SQ",
      Value: [
        {
          "00186012": el("US", 1), // Region Spatial Format: 2D tissue
          "00186014": el("US", 1), // Region Data Type: tissue
          "00186016": el("UL", 0),
          "00186018": el("UL", 0),
          "0018601A": el("UL", 0),
          "0018601C": el("UL", o.width - 1),
          "0018601E": el("UL", o.height - 1),
          "00186024": el("US", 3), // Physical Units X Direction: cm
          "00186026": el("US", 3),
          "0018602C": el("FD", o.depthCm / o.height),
          "0018602E": el("FD", o.depthCm / o.height),
          "00186030": el("UL", Math.round(o.frequencyMHz * 1000)), // kHz
          "00186031": el("CS", o.transducerType),
        },
      ],
    },
    "0020000D": el("UI", o.studyUid),
    "0020000E": el("UI", `${o.studyUid}.1`),
    "00200010": el("SH", "STUDY-7"),
    "00280002": el("US", 1),
    "00280004": el("CS", "MONOCHROME2"),
    "00280008": el("IS", o.frames),
    "00280009": el("AT", 0x00181063),
    "00280010": el("US", o.height),
    "00280011": el("US", o.width),
    "00280100": el("US", 8),
    "00280101": el("US", 8),
    "00280102": el("US", 7),
    "00280103": el("US", 0),
    "00280301": el("CS", "YES"),
    "7FE00010": { vr: "OB", Value: [o.pixels.buffer.slice(o.pixels.byteOffset, o.pixels.byteOffset + o.pixels.byteLength)] },
  };
  const file = new dcmjs.data.DicomDict(meta);
  file.dict = dict as typeof file.dict;
  return Buffer.from(file.write());
}

/**
 * Frames of an invented ultrasound-like clip (seeds/clips/generate.ts) as raw 8-bit grey,
 * for a DICOM object: `frames` frames at `fps`.
 */
export async function demoFrames(o: DemoImageOptions & { frames: number; fps: number }): Promise<Buffer> {
  const dir = await fs.mkdtemp(path.join(os.tmpdir(), "soundings-gen-dicom-"));
  try {
    const clip = path.join(dir, "clip.mp4");
    await generateDemoClip(clip, { ...o, seconds: o.frames / o.fps + 0.5, codec: "h264", container: "mp4" });
    const raw = path.join(dir, "frames.gray");
    await ffmpeg(
      ["-i", fileUrl(clip), "-frames:v", String(o.frames), "-f", "rawvideo", "-pix_fmt", "gray", "-y", fileUrl(raw)],
      "The demo DICOM frames could not be made",
    );
    const pixels = await fs.readFile(raw);
    if (pixels.length !== o.width * o.height * o.frames) throw new Error(`expected ${o.frames} frames of ${o.width}×${o.height}, got ${pixels.length} bytes`);
    return pixels;
  } finally {
    await fs.rm(dir, { recursive: true, force: true });
  }
}
