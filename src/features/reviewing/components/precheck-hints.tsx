// The image pre-check of a clip, shown as quiet hints beside it: gain, unused depth, the
// calibrated depth against the application's usual range (DICOM clips), and the footprint's
// shape against the transducer recorded on the exam. Hints are computed from a
// few frames; they help the reviewer look, and never score anything.
import { Info } from "lucide-react";
import { TRANSDUCER_LABELS } from "../../../lib/catalogue";
import type { BlindedExam } from "../api/workspace";

interface Precheck {
  gain?: { hint?: string; meanLuma?: number };
  depth?: { hint?: string; unusedShare?: number; cm?: number; typicalCm?: [number, number]; against?: string };
  footprint?: { shape?: string };
  transducerMatch?: boolean | null;
}

const SHAPE_WORDS: Record<string, string> = { linear: "rectangular (linear)", curvilinear: "curved (curvilinear)", phased: "narrow sector (phased array)" };

/** Reads the pre-check the server stored; anything missing or unexpected is simply left out. */
function readPrecheck(value: unknown): Precheck | null {
  return value && typeof value === "object" ? (value as Precheck) : null;
}

/** The hint sentences for a stored pre-check (exported for its test). */
export function hints(p: Precheck, transducer: BlindedExam["transducer"]): string[] {
  const out: string[] = [];
  const luma = typeof p.gain?.meanLuma === "number" ? ` (mean brightness ${Math.round(p.gain.meanLuma)} of 255)` : "";
  if (p.gain?.hint === "low") out.push(`Gain may be low${luma}.`);
  else if (p.gain?.hint === "high") out.push(`Gain may be high${luma}.`);
  else if (p.gain?.hint === "balanced") out.push(`Gain looks balanced${luma}.`);

  const unused = typeof p.depth?.unusedShare === "number" ? Math.round(p.depth.unusedShare * 100) : null;
  if (p.depth?.hint === "too_deep") out.push(`Depth may be too deep: about ${unused ?? "—"}% of the image at the bottom shows nothing.`);
  else if (p.depth?.hint === "maybe_shallow") out.push("Depth may be shallow: structures reach the bottom edge.");
  else if (p.depth?.hint === "fits") out.push(`Depth looks fitted${unused !== null ? ` (${unused}% unused at the bottom)` : ""}.`);

  const cm = p.depth?.cm;
  if (typeof cm === "number") {
    const range = Array.isArray(p.depth?.typicalCm) ? ` (${p.depth.typicalCm[0]}–${p.depth.typicalCm[1]} cm)` : "";
    const said = `Imaging depth ${cm} cm, from the DICOM calibration`;
    if (p.depth?.against === "deeper_than_typical") out.push(`${said}: deeper than usual for this application${range}.`);
    else if (p.depth?.against === "shallower_than_typical") out.push(`${said}: shallower than usual for this application${range}.`);
    else if (p.depth?.against === "within_typical") out.push(`${said}: within the usual range for this application${range}.`);
    else out.push(`${said}.`);
  }

  const shape = p.footprint?.shape;
  if (shape && shape !== "unknown") {
    const match = typeof p.transducerMatch === "boolean" ? p.transducerMatch : shape === transducer;
    const recorded = TRANSDUCER_LABELS[transducer].toLowerCase();
    out.push(
      match
        ? `Footprint ${SHAPE_WORDS[shape] ?? shape} fits the ${recorded} transducer recorded.`
        : `Footprint looks ${SHAPE_WORDS[shape] ?? shape}, but the exam records a ${recorded} transducer.`,
    );
  }
  return out;
}

export function PrecheckHints({ precheck, transducer }: { precheck: unknown; transducer: BlindedExam["transducer"] }) {
  const p = readPrecheck(precheck);
  const list = p ? hints(p, transducer) : [];
  return (
    <section aria-labelledby="precheck-heading" className="border-t border-ink-800 px-3 py-2 text-xs text-ink-200">
      <h3 id="precheck-heading" className="flex items-center gap-1.5 font-semibold text-ink-100">
        <Info aria-hidden="true" className="size-3.5" />
        Pre-check hints <span className="font-normal text-ink-300">— from a few frames; they never score</span>
      </h3>
      {list.length === 0 ? (
        <p className="mt-1">No pre-check for this clip.</p>
      ) : (
        <ul className="mt-1 space-y-0.5">
          {list.map((h) => (
            <li key={h}>{h}</li>
          ))}
        </ul>
      )}
    </section>
  );
}
