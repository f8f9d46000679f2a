// The demo seed's clip set: a handful of invented clips and stills covering each footprint, gain
// level and depth situation the pre-check hints describe, so the review screens have variety.
import fs from "node:fs/promises";
import path from "node:path";
import { generateDemoClip, generateDemoStill, type DemoClipOptions, type DemoImageOptions } from "./generate";

export interface DemoClipSpec {
  /** File name inside the output folder. */
  file: string;
  /** The transducer a demo exam would record with it. */
  transducer: "linear" | "curvilinear" | "phased";
  clip?: DemoClipOptions;
  still?: DemoImageOptions;
}

const size = { width: 640, height: 480 };
const clip = { ...size, seconds: 3, fps: 15, keyframeEvery: 1 };

/** Invented clips: labels name only the invented program and generic probe/depth settings. */
export const DEMO_CLIPS: DemoClipSpec[] = [
  {
    file: "curved-balanced.mp4",
    transducer: "curvilinear",
    clip: { ...clip, footprint: "curvilinear", unusedDepth: 0.1, seed: 11, label: "CEDAR HOLLOW  C5  16cm" },
  },
  {
    file: "curved-deep.mp4",
    transducer: "curvilinear",
    clip: { ...clip, footprint: "curvilinear", unusedDepth: 0.4, seed: 12, label: "CEDAR HOLLOW  C5  24cm" },
  },
  {
    file: "curved-low-gain.avi",
    transducer: "curvilinear",
    clip: { ...clip, footprint: "curvilinear", gain: "low", unusedDepth: 0.1, container: "avi", seed: 13 },
  },
  { file: "sector-balanced.mp4", transducer: "phased", clip: { ...clip, footprint: "phased", unusedDepth: 0.08, seed: 21, label: "CEDAR HOLLOW  P3  16cm" } },
  {
    file: "sector-high-gain.webm",
    transducer: "phased",
    clip: { ...clip, footprint: "phased", gain: "high", unusedDepth: 0.08, container: "webm", seed: 22, label: "CEDAR HOLLOW  P3  18cm" },
  },
  {
    file: "linear-balanced.mp4",
    transducer: "linear",
    clip: { ...clip, footprint: "linear", unusedDepth: 0.1, fluid: true, seed: 31, label: "CEDAR HOLLOW  L12  4cm" },
  },
  {
    file: "linear-shallow.mov",
    transducer: "linear",
    clip: { ...clip, footprint: "linear", unusedDepth: 0, container: "mov", seed: 32, label: "CEDAR HOLLOW  L12  3cm" },
  },
  { file: "linear-still.png", transducer: "linear", still: { ...size, footprint: "linear", unusedDepth: 0.1, seed: 33, label: "CEDAR HOLLOW  L12  5cm" } },
  {
    file: "curved-still.jpg",
    transducer: "curvilinear",
    still: { ...size, footprint: "curvilinear", unusedDepth: 0.15, seed: 14, label: "CEDAR HOLLOW  C5  14cm" },
  },
];

/** Writes the demo set into outDir (two at a time, to leave the machine usable); returns the paths. */
export async function generateDemoSet(outDir: string, specs: DemoClipSpec[] = DEMO_CLIPS): Promise<{ spec: DemoClipSpec; path: string }[]> {
  await fs.mkdir(outDir, { recursive: true });
  const done: { spec: DemoClipSpec; path: string }[] = [];
  const queue = [...specs];
  const worker = async () => {
    for (let spec = queue.shift(); spec; spec = queue.shift()) {
      const file = path.join(outDir, spec.file);
      if (spec.clip) await generateDemoClip(file, spec.clip);
      else if (spec.still) await generateDemoStill(file, spec.still);
      done.push({ spec, path: file });
    }
  };
  await Promise.all([worker(), worker()]);
  return specs.map((s) => done.find((d) => d.spec === s)!);
}
