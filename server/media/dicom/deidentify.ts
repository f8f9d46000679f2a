// De-identification of a DICOM object by the Basic Application Level Confidentiality Profile
// (DICOM PS3.15 Annex E; the actions per attribute are in ./profile.ts): attributes removed,
// emptied or given dummy values, UIDs replaced (the same original UID gives the same new UID
// within one exam, so the instances of a study still belong together), private attributes
// removed, and the object marked as de-identified: Patient Identity Removed = YES, the
// De-identification Method and its code sequence (codes 113100 "Basic Application
// Confidentiality Profile" and, when pixels were cleaned, 113101 "Clean Pixel Data Option",
// from DICOM PS3.16 CID 7050 — codes written from memory of that table). Burned In Annotation
// is set to NO only when the Clean Pixel Data Option was applied.
import crypto from "node:crypto";
import dcmjs from "dcmjs";
import { actionFor } from "./profile";
import type { DicomDict, DicomElement } from "./read";

/** A new UID under the 2.25 root (PS3.5 B.2): the decimal form of a UUID derived from the exam's secret and the old UID. */
export function replacementUid(secret: string, uid: string): string {
  const h = crypto.createHmac("sha256", secret).update(uid).digest().subarray(0, 16);
  h[6] = (h[6] & 0x0f) | 0x80; // UUID version 8 (name-based, custom hash)
  h[8] = (h[8] & 0x3f) | 0x80; // RFC 4122 variant
  return `2.25.${BigInt(`0x${h.toString("hex")}`).toString(10)}`;
}

/** Soundings' implementation class UID in the file meta information (a fixed 2.25 UID). */
export const IMPLEMENTATION_UID = replacementUid("soundings", "implementation class uid");

/** A dummy value of the element's VR (the "D" action). */
function dummy(vr: string): unknown[] {
  switch (vr) {
    case "PN":
      return [{ Alphabetic: "ANONYMOUS" }];
    case "DA":
      return ["19000101"];
    case "TM":
      return ["000000"];
    case "DT":
      return ["19000101000000"];
    case "SQ":
      return [];
    case "DS":
    case "IS":
    case "FL":
    case "FD":
    case "SL":
    case "SS":
    case "UL":
    case "US":
      return [0];
    default:
      return ["ANONYMIZED"];
  }
}

function clean(dataset: Record<string, DicomElement>, uid: (u: string) => string): void {
  for (const tag of Object.keys(dataset)) {
    const el = dataset[tag];
    const action = actionFor(tag);
    if (action === "X") {
      delete dataset[tag];
      continue;
    }
    if (action === "K") {
      if (el.vr === "SQ") for (const item of (el.Value ?? []) as Record<string, DicomElement>[]) clean(item, uid);
      continue;
    }
    delete el._rawValue;
    if (action === "Z") el.Value = [];
    else if (action === "D") el.Value = dummy(el.vr);
    else if (action === "U") el.Value = (el.Value ?? []).map((v) => uid(String(v)));
  }
}

export interface Deidentified {
  bytes: Buffer;
  /** The new Study Instance UID (consistent within the exam). */
  studyInstanceUid: string | null;
  sopInstanceUid: string | null;
}

/**
 * De-identifies the file in place and returns its bytes. `uidSecret` is per exam: the same
 * original UID gets the same replacement within it and an unrelated one elsewhere.
 * `cleanedPixels` says the caller replaced the pixel data with redacted pixels.
 */
export function deidentify(file: DicomDict, opts: { uidSecret: string; cleanedPixels?: boolean }): Deidentified {
  const uid = (u: string) => replacementUid(opts.uidSecret, u);
  clean(file.dict, uid);
  const d = file.dict;
  markDeidentified(file, opts.cleanedPixels ?? false);
  // The file meta information names the instance too.
  const sop = d["00080018"]?.Value?.[0] as string | undefined;
  if (sop) file.meta["00020003"] = { vr: "UI", Value: [sop] };
  delete file.meta["00020016"]; // Source Application Entity Title: the sender's name
  // The writing software is Soundings, not the device's toolkit.
  file.meta["00020012"] = { vr: "UI", Value: [IMPLEMENTATION_UID] };
  file.meta["00020013"] = { vr: "SH", Value: ["SOUNDINGS_1"] };
  const bytes = Buffer.from(file.write());
  return { bytes, studyInstanceUid: (d["0020000D"]?.Value?.[0] as string | undefined) ?? null, sopInstanceUid: sop ?? null };
}

const code = (value: string, meaning: string) => ({
  "00080100": { vr: "SH", Value: [value] },
  "00080102": { vr: "SH", Value: ["DCM"] },
  "00080104": { vr: "LO", Value: [meaning] },
});

/** Patient Identity Removed, the method and its codes; with `cleanedPixels` also the Clean Pixel Data Option and Burned In Annotation NO. */
export function markDeidentified(file: DicomDict, cleanedPixels: boolean): void {
  const d = file.dict;
  d["00120062"] = { vr: "CS", Value: ["YES"] };
  d["00120063"] = { vr: "LO", Value: [cleanedPixels ? "PS3.15 Basic Profile with Clean Pixel Data Option" : "PS3.15 Basic Profile"] };
  d["00120064"] = {
    vr: "SQ",
    Value: [code("113100", "Basic Application Confidentiality Profile"), ...(cleanedPixels ? [code("113101", "Clean Pixel Data Option")] : [])],
  };
  if (cleanedPixels) d["00280301"] = { vr: "CS", Value: ["NO"] };
}

/** Reads de-identified bytes back (for tests and the inbox preview). */
export function readBack(bytes: Buffer): DicomDict {
  return dcmjs.data.DicomMessage.readFile(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer) as unknown as DicomDict;
}
