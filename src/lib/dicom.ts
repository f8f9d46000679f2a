// The facts a DICOM clip carried (depth from its region calibration, transducer, frame rate),
// as short label–value pairs for the exam and scoring pages.
import type { DicomFactsView } from "../../shared/schemas/exams";

export function dicomFacts(d: DicomFactsView | null | undefined): [string, string][] {
  if (!d) return [];
  const out: [string, string][] = [["Source", `DICOM, ${d.sopClass}`]];
  if (d.depthCm !== null) out.push(["Depth", `${d.depthCm} cm`]);
  if (d.frequencyMHz !== null) out.push(["Frequency", `${d.frequencyMHz} MHz`]);
  if (d.transducerType) out.push(["Transducer", d.transducerType.toLowerCase().replace(/_/g, " ")]);
  out.push(["Frames", d.frameRate !== null ? `${d.frames} at ${Math.round(d.frameRate * 10) / 10} a second` : String(d.frames)]);
  return out;
}

/** One line for tight places: "DICOM · 8 cm · 5 MHz · 10 frames". */
export function dicomLine(d: DicomFactsView | null | undefined): string | null {
  if (!d) return null;
  return [
    "DICOM",
    d.depthCm !== null ? `${d.depthCm} cm` : null,
    d.frequencyMHz !== null ? `${d.frequencyMHz} MHz` : null,
    `${d.frames} ${d.frames === 1 ? "frame" : "frames"}`,
  ]
    .filter(Boolean)
    .join(" · ");
}
