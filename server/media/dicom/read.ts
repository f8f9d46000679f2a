// Reads a DICOM Part 10 file (dcmjs) and says whether Soundings can take it: an ultrasound
// image, ultrasound multi-frame image or secondary capture, in a transfer syntax the decoder
// handles; anything else is refused with a MediaError that names what was found. Also takes
// the facts worth keeping before de-identification removes them: imaging depth from the
// Sequence of Ultrasound Regions, transducer frequency and type, frame rate and frame count.
import dcmjs from "dcmjs";
import { MediaError } from "../exec";

// dcmjs warns on every private or unknown attribute it naturalises; those are expected here.
dcmjs.log.setLevel("error");

/** Transfer syntaxes DCMTK's dcmj2pnm decodes (PS3.5 Table A-1 and the DCMTK documentation). */
export const SUPPORTED_TRANSFER_SYNTAXES: Record<string, string> = {
  "1.2.840.10008.1.2": "Implicit VR Little Endian",
  "1.2.840.10008.1.2.1": "Explicit VR Little Endian",
  "1.2.840.10008.1.2.5": "RLE Lossless",
  "1.2.840.10008.1.2.4.50": "JPEG Baseline (Process 1)",
  "1.2.840.10008.1.2.4.51": "JPEG Extended (Process 2 and 4)",
  "1.2.840.10008.1.2.4.57": "JPEG Lossless, Non-Hierarchical (Process 14)",
  "1.2.840.10008.1.2.4.70": "JPEG Lossless, First-Order Prediction (Process 14, Selection Value 1)",
};

/** Other transfer syntaxes by name, so a refusal says which one was found. */
const OTHER_TRANSFER_SYNTAXES: Record<string, string> = {
  "1.2.840.10008.1.2.1.99": "Deflated Explicit VR Little Endian",
  "1.2.840.10008.1.2.2": "Explicit VR Big Endian",
  "1.2.840.10008.1.2.4.80": "JPEG-LS Lossless",
  "1.2.840.10008.1.2.4.81": "JPEG-LS Near-Lossless",
  "1.2.840.10008.1.2.4.90": "JPEG 2000 (Lossless Only)",
  "1.2.840.10008.1.2.4.91": "JPEG 2000",
  "1.2.840.10008.1.2.4.100": "MPEG2 Main Profile",
  "1.2.840.10008.1.2.4.101": "MPEG2 Main Profile High Level",
  "1.2.840.10008.1.2.4.102": "MPEG-4 AVC/H.264 High Profile",
  "1.2.840.10008.1.2.4.103": "MPEG-4 AVC/H.264 BD-compatible High Profile",
  "1.2.840.10008.1.2.4.201": "High-Throughput JPEG 2000",
};

/** Storage SOP classes taken (PS3.4 Annex B): ultrasound images and secondary captures. */
export const IMAGE_SOP_CLASSES: Record<string, string> = {
  "1.2.840.10008.5.1.4.1.1.6.1": "Ultrasound Image",
  "1.2.840.10008.5.1.4.1.1.3.1": "Ultrasound Multi-frame Image",
  "1.2.840.10008.5.1.4.1.1.6": "Ultrasound Image (retired)",
  "1.2.840.10008.5.1.4.1.1.3": "Ultrasound Multi-frame Image (retired)",
  "1.2.840.10008.5.1.4.1.1.7": "Secondary Capture Image",
  "1.2.840.10008.5.1.4.1.1.7.2": "Multi-frame Grayscale Byte Secondary Capture Image",
  "1.2.840.10008.5.1.4.1.1.7.3": "Multi-frame Grayscale Word Secondary Capture Image",
  "1.2.840.10008.5.1.4.1.1.7.4": "Multi-frame True Color Secondary Capture Image",
};

/** A few SOP classes people send by mistake, named in the refusal. */
const OTHER_SOP_CLASSES: Record<string, string> = {
  "1.2.840.10008.5.1.4.1.1.481.5": "RT Plan",
  "1.2.840.10008.5.1.4.1.1.88.11": "Basic Text SR",
  "1.2.840.10008.5.1.4.1.1.88.22": "Enhanced SR",
  "1.2.840.10008.5.1.4.1.1.88.33": "Comprehensive SR",
  "1.2.840.10008.5.1.4.1.1.104.1": "Encapsulated PDF",
  "1.2.840.10008.5.1.4.1.1.11.1": "Grayscale Softcopy Presentation State",
  "1.2.840.10008.5.1.4.1.1.2": "CT Image",
  "1.2.840.10008.5.1.4.1.1.4": "MR Image",
  "1.2.840.10008.5.1.4.1.1.1": "Computed Radiography Image",
};

export const TRANSFER_SYNTAX_NAMES: Record<string, string> = { ...SUPPORTED_TRANSFER_SYNTAXES, ...OTHER_TRANSFER_SYNTAXES };

export type DicomDict = { meta: Record<string, DicomElement>; dict: Record<string, DicomElement>; write(): ArrayBuffer };
export interface DicomElement {
  vr: string;
  Value?: unknown[];
  _rawValue?: unknown;
}

/** What the product keeps about a DICOM object (never a name or an identifier). */
export interface DicomFacts {
  sopClassUid: string;
  sopClass: string;
  transferSyntaxUid: string;
  transferSyntax: string;
  rows: number;
  columns: number;
  frames: number;
  /** Frames per second: from Frame Time, else Cine Rate, else Recommended Display Frame Rate. */
  frameRate: number | null;
  /** Imaging depth in cm: the 2D tissue region's rows × Physical Delta Y, else Depth of Scan Field. */
  depthCm: number | null;
  depthSource: "regions" | "depth_of_scan_field" | null;
  /** Transducer frequency in MHz, from the region's Transducer Frequency (kHz). */
  frequencyMHz: number | null;
  transducerType: string | null;
  manufacturer: string | null;
  modelName: string | null;
  burnedInAnnotation: string | null;
}

export interface ReadDicom {
  file: DicomDict;
  facts: DicomFacts;
  /** Identifying values read before removal, for matching a received study to a person; never stored as such. */
  operatorNames: string[];
  studyInstanceUid: string | null;
}

const first = (el: DicomElement | undefined): unknown => el?.Value?.[0];
const num = (el: DicomElement | undefined): number | null => {
  const v = Number(first(el));
  return Number.isFinite(v) ? v : null;
};
const str = (el: DicomElement | undefined): string | null => {
  const v = first(el);
  if (v === undefined || v === null) return null;
  const s = typeof v === "object" && "Alphabetic" in (v as object) ? String((v as { Alphabetic: unknown }).Alphabetic ?? "") : String(v);
  return s.trim() || null;
};
const round = (x: number, d: number) => Math.round(x * 10 ** d) / 10 ** d;

/** The 2D tissue region of the Sequence of Ultrasound Regions (PS3.3 C.8.5.5). */
function regionDepth(dict: Record<string, DicomElement>): { depthCm: number | null; frequencyMHz: number | null; transducerType: string | null } {
  const items = (dict["00186011"]?.Value ?? []) as Record<string, DicomElement>[];
  // Region Spatial Format 1 = 2D; Region Data Type 1 = tissue; Physical Units Y 3 = cm.
  const tissue = items.find((r) => num(r["00186012"]) === 1 && num(r["00186014"]) === 1) ?? items.find((r) => num(r["00186012"]) === 1);
  if (!tissue) return { depthCm: null, frequencyMHz: null, transducerType: null };
  const minY = num(tissue["0018601A"]);
  const maxY = num(tissue["0018601E"]);
  const deltaY = num(tissue["0018602E"]);
  const unitsY = num(tissue["00186026"]);
  const depthCm = minY !== null && maxY !== null && deltaY && unitsY === 3 && maxY >= minY ? round((maxY - minY + 1) * Math.abs(deltaY), 2) : null;
  const khz = num(tissue["00186030"]);
  return { depthCm, frequencyMHz: khz ? round(khz / 1000, 2) : null, transducerType: str(tissue["00186031"]) };
}

/**
 * Whether the file holds all of its top-level Pixel Data (7FE0,0010): the last element header
 * with that tag, and its declared length (or, encapsulated, the sequence delimiter at the end),
 * fit in the file. The parser pads a short value with zeros, so a cut file is found here.
 */
export function pixelDataComplete(buf: Buffer, implicitVr: boolean): boolean {
  const tag = Buffer.from([0xe0, 0x7f, 0x10, 0x00]);
  for (let at = buf.lastIndexOf(tag); at >= 132; at = buf.lastIndexOf(tag, at - 1)) {
    if (implicitVr) {
      if (at + 8 > buf.length) return false;
      return at + 8 + buf.readUInt32LE(at + 4) <= buf.length;
    }
    const vr = buf.toString("latin1", at + 4, at + 6);
    if (!["OB", "OW"].includes(vr) || buf.readUInt16LE(at + 6) !== 0) continue;
    if (at + 12 > buf.length) return false;
    const length = buf.readUInt32LE(at + 8);
    if (length === 0xffffffff) return buf.subarray(-8).equals(Buffer.from([0xfe, 0xff, 0xdd, 0xe0, 0, 0, 0, 0]));
    return at + 12 + length <= buf.length;
  }
  return false;
}

/** Parses the file and checks it is an image Soundings can decode; throws a MediaError naming what it is otherwise. */
export function readDicom(buf: Buffer): ReadDicom {
  let file: DicomDict;
  try {
    const ab = buf.buffer.slice(buf.byteOffset, buf.byteOffset + buf.byteLength) as ArrayBuffer;
    file = dcmjs.data.DicomMessage.readFile(ab) as unknown as DicomDict;
  } catch (err) {
    throw new MediaError(
      `The DICOM file could not be read; it may be cut short or damaged (${err instanceof Error ? err.message.slice(0, 120) : "unreadable"})`,
    );
  }
  const { meta, dict } = file;
  const ts = str(meta["00020010"]) ?? "1.2.840.10008.1.2";
  const sop = str(meta["00020002"]) ?? str(dict["00080016"]) ?? "";
  if (!IMAGE_SOP_CLASSES[sop]) {
    const name = OTHER_SOP_CLASSES[sop];
    throw new MediaError(
      `This DICOM object is ${name ? `${/^[AEIOU]|^RT|^MR/.test(name) ? "an" : "a"} ${name} object` : `of SOP class ${sop || "(none given)"}`}, not an ultrasound image or a secondary capture`,
    );
  }
  if (!SUPPORTED_TRANSFER_SYNTAXES[ts]) {
    throw new MediaError(
      `This DICOM image is encoded as ${TRANSFER_SYNTAX_NAMES[ts] ?? "an unknown transfer syntax"} (${ts}), which Soundings cannot decode; export it as uncompressed, RLE or JPEG baseline`,
    );
  }
  const pixels = dict["7FE00010"];
  if (!pixels?.Value?.length) throw new MediaError("This DICOM image has no pixel data");
  if (!pixelDataComplete(buf, ts === "1.2.840.10008.1.2"))
    throw new MediaError("The DICOM file is cut short: its pixel data ends before the length it declares");
  const rows = num(dict["00280010"]) ?? 0;
  const columns = num(dict["00280011"]) ?? 0;
  const frames = Math.max(1, num(dict["00280008"]) ?? 1);
  if (!rows || !columns) throw new MediaError("This DICOM image gives no size (Rows and Columns)");
  // Native (uncompressed) pixel data must hold every frame.
  if (["1.2.840.10008.1.2", "1.2.840.10008.1.2.1"].includes(ts)) {
    const samples = num(dict["00280002"]) ?? 1;
    const bits = num(dict["00280100"]) ?? 8;
    const photometric = str(dict["00280004"]) ?? "";
    // YBR_FULL_422 keeps two luma samples and one chroma pair for every two pixels.
    const perPixel = photometric === "YBR_FULL_422" ? 2 : samples;
    const expected = rows * columns * perPixel * (bits / 8) * frames;
    const have = (pixels.Value as ArrayBuffer[]).reduce((n, b) => n + b.byteLength, 0);
    if (have < expected) throw new MediaError(`The DICOM file is cut short: its pixel data holds ${have} of the ${expected} bytes its ${frames} frame(s) need`);
  }
  const frameTime = num(dict["00181063"]);
  const cineRate = num(dict["00180040"]);
  const displayRate = num(dict["00082144"]);
  const frameRate =
    frameTime && frameTime > 0 ? round(1000 / frameTime, 3) : cineRate && cineRate > 0 ? cineRate : displayRate && displayRate > 0 ? displayRate : null;
  const region = regionDepth(dict);
  const scanField = num(dict["00185050"]);
  const depthCm = region.depthCm ?? (scanField && scanField > 0 ? round(scanField / 10, 2) : null);
  const operatorNames = ((dict["00081070"]?.Value ?? []) as unknown[])
    .map((v) => (typeof v === "object" && v ? String((v as { Alphabetic?: unknown }).Alphabetic ?? "") : String(v)).trim())
    .filter(Boolean);
  return {
    file,
    operatorNames,
    studyInstanceUid: str(dict["0020000D"]),
    facts: {
      sopClassUid: sop,
      sopClass: IMAGE_SOP_CLASSES[sop],
      transferSyntaxUid: ts,
      transferSyntax: SUPPORTED_TRANSFER_SYNTAXES[ts],
      rows,
      columns,
      frames,
      frameRate,
      depthCm,
      depthSource: region.depthCm !== null ? "regions" : depthCm !== null ? "depth_of_scan_field" : null,
      frequencyMHz: region.frequencyMHz,
      transducerType: region.transducerType ?? str(dict["00186031"]),
      manufacturer: str(dict["00080070"]),
      modelName: str(dict["00081090"]),
      burnedInAnnotation: str(dict["00280301"]),
    },
  };
}
