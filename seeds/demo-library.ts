// How the demo records each application, and the clips it records with: one invented clip per
// view, generated once with ffmpeg and kept in a library folder. A clip shows dark (anechoic)
// areas only where the anatomy is normally fluid-filled (heart chambers, gallbladder, bladder,
// globe, vessels) or where the exam's case has a fluid finding in that view, so a demo read of
// "free fluid, right upper quadrant: positive" comes with a right-upper-quadrant clip that shows
// it. Findings the generator cannot draw (sliding, wall motion, compressibility) are read as
// absent in every demo case. A case whose reviewer scores the depth too deep or the gain too high
// gets clips recorded that way. Everything here is invented; no patient images.
import crypto from "node:crypto";
import fs from "node:fs";
import fsp from "node:fs/promises";
import path from "node:path";
import { generateDemoClip, generateDemoStill, type DemoImageOptions, type Footprint } from "./clips/generate";
import { demoFrames, demoUid, usObject } from "./clips/dicom";

export interface Protocol {
  transducer: "linear" | "curvilinear" | "phased";
  preset: string;
  depthCm: number;
  /** Views recorded with another footprint than the transducer's (an eFAST's cardiac and lung windows). */
  footprints?: Record<string, Footprint>;
  /** Views recorded at another depth than the protocol's. */
  depths?: Record<string, number>;
  /** Views whose normal anatomy is anechoic. */
  anechoic?: string[];
  /** Fluid findings and the views that show them. */
  fluid?: Record<string, string[]>;
  /** Stills rather than clips (a soft-tissue study). */
  stills?: boolean;
}

export const PROTOCOLS: Record<string, Protocol> = {
  efast: {
    transducer: "curvilinear",
    preset: "Abdomen",
    depthCm: 16,
    footprints: { subxiphoid: "phased", chest_right: "linear", chest_left: "linear" },
    depths: { chest_right: 5, chest_left: 5 },
    anechoic: ["subxiphoid"],
    fluid: {
      free_fluid_ruq: ["ruq"],
      free_fluid_luq: ["luq"],
      free_fluid_pelvis: ["pelvis_long", "pelvis_trans"],
      hemothorax_right: ["ruq"],
      hemothorax_left: ["luq"],
    },
  },
  cardiac: { transducer: "phased", preset: "Cardiac", depthCm: 16, anechoic: ["plax", "psax", "a4c", "subxiphoid", "ivc"] },
  shock: {
    transducer: "phased",
    preset: "Cardiac",
    depthCm: 16,
    footprints: { ruq: "curvilinear", luq: "curvilinear", pelvis: "curvilinear", aorta: "curvilinear", lung_right: "linear", lung_left: "linear" },
    depths: { lung_right: 5, lung_left: 5 },
    anechoic: ["plax", "subxiphoid", "a4c", "ivc", "aorta"],
    fluid: { free_fluid: ["ruq", "pelvis"] },
  },
  cardiac_arrest: { transducer: "phased", preset: "Cardiac", depthCm: 18, anechoic: ["subxiphoid", "plax", "a4c"] },
  aorta: {
    transducer: "curvilinear",
    preset: "Abdomen",
    depthCm: 14,
    anechoic: ["proximal_trans", "mid_trans", "distal_trans", "longitudinal", "bifurcation"],
  },
  biliary: {
    transducer: "curvilinear",
    preset: "Abdomen",
    depthCm: 12,
    anechoic: ["gb_long", "gb_trans"],
    fluid: { pericholecystic_fluid: ["gb_long", "gb_trans"] },
  },
  renal: {
    transducer: "curvilinear",
    preset: "Abdomen",
    depthCm: 14,
    anechoic: ["bladder"],
    fluid: { hydronephrosis_right: ["right_long", "right_trans"], hydronephrosis_left: ["left_long", "left_trans"] },
  },
  lung: {
    transducer: "linear",
    preset: "Lung",
    depthCm: 5,
    footprints: { base_right: "curvilinear", base_left: "curvilinear" },
    depths: { base_right: 14, base_left: 14 },
    fluid: { pleural_effusion_right: ["base_right"], pleural_effusion_left: ["base_left"] },
  },
  dvt: { transducer: "linear", preset: "Vascular", depthCm: 4, anechoic: ["cfv_open", "popliteal_open"] },
  pelvic: {
    transducer: "curvilinear",
    preset: "Obstetric",
    depthCm: 14,
    fluid: { iup: ["uterus_long", "uterus_trans"], free_fluid_pelvis: ["rectouterine"], free_fluid_ruq: ["ruq"] },
  },
  ocular: { transducer: "linear", preset: "Ocular (low output)", depthCm: 5, anechoic: ["globe_trans", "globe_sag", "onsd"] },
  soft_tissue: {
    transducer: "linear",
    preset: "MSK",
    depthCm: 3,
    stills: true,
    fluid: { abscess: ["plane_1", "plane_2"], joint_effusion: ["plane_1", "plane_2"] },
  },
  vascular_access: { transducer: "linear", preset: "Vascular", depthCm: 3, anechoic: ["target_short", "target_long", "wire"] },
  nerve_block: { transducer: "linear", preset: "Nerve", depthCm: 4, anechoic: ["spread"] },
};

/** One recorded view: everything the generated picture depends on. */
export interface Shot {
  view: string;
  footprint: Footprint;
  depthCm: number;
  fluid: boolean;
  gain: "low" | "balanced" | "high";
  /** Unused depth below the target (the depth set too deep). */
  deep: boolean;
  still: boolean;
  /** "dcm": an ultrasound multi-frame DICOM object, as a machine exports it (invented identity inside). */
  container: "mp4" | "avi" | "dcm";
}

export interface LibraryFile {
  path: string;
  name: string;
  kind: "video" | "still";
  mime: string;
}

/** The library file name of a shot; equal shots share one file. */
export function shotFile(s: Shot): string {
  const ext = s.still ? "png" : s.container;
  return `${s.view}-${s.footprint}-${s.depthCm}cm-${s.fluid ? "fluid" : "clear"}-${s.gain}${s.deep ? "-deep" : ""}.${ext}`;
}

/** What a case records in one view of an application: fluid where the anatomy or a positive fluid finding puts it. */
export function shotFor(
  appCode: string,
  view: string,
  positives: readonly string[],
  look: { gain?: Shot["gain"]; deep?: boolean; container?: Shot["container"] } = {},
): Shot {
  const p = PROTOCOLS[appCode];
  if (!p) throw new Error(`the demo has no recording protocol for the application "${appCode}"`);
  const fluid = (p.anechoic ?? []).includes(view) || positives.some((f) => (p.fluid?.[f] ?? []).includes(view));
  return {
    view,
    footprint: p.footprints?.[view] ?? p.transducer,
    depthCm: (p.depths?.[view] ?? p.depthCm) + (look.deep ? 8 : 0),
    fluid,
    gain: look.gain ?? "balanced",
    deep: look.deep ?? false,
    still: p.stills ?? false,
    container: look.container ?? "mp4",
  };
}

/** The burned-in line: an invented device line with the view and depth, no program or person. */
const labelOf = (s: Shot) => `DEMO  ${s.view.toUpperCase().replace(/_/g, " ")}  ${s.depthCm}cm`;
const seedOf = (name: string) => crypto.createHash("sha256").update(name).digest().readUInt32BE(0) % 100_000;

/** Generates the shots missing from the library folder (two at a time) and returns every shot's file. */
export async function ensureLibrary(dir: string, shots: readonly Shot[], log: (s: string) => void = () => {}): Promise<Map<string, LibraryFile>> {
  await fsp.mkdir(dir, { recursive: true });
  const unique = [...new Map(shots.map((s) => [shotFile(s), s])).entries()];
  const files = new Map<string, LibraryFile>();
  let made = 0;
  for (let i = 0; i < unique.length; i += 2) {
    await Promise.all(
      unique.slice(i, i + 2).map(async ([name, s]) => {
        const out = path.join(dir, name);
        if (!fs.existsSync(out)) {
          const image = imageOf(s, name);
          if (s.still) await generateDemoStill(out, image);
          else if (s.container === "dcm") await fsp.writeFile(out, await demoDicom(s, image));
          else await generateDemoClip(out, { ...image, seconds: 2, fps: 15, container: s.container });
          made++;
        }
        files.set(name, {
          path: out,
          name,
          kind: s.still ? "still" : "video",
          mime: s.still ? "image/png" : { avi: "video/x-msvideo", dcm: "application/dicom", mp4: "video/mp4" }[s.container],
        });
      }),
    );
  }
  if (made) log(`Generated ${made} demo clips in ${dir}`);
  return files;
}

/** The transducer a footprint stands for in DICOM, with a typical centre frequency (common practice). */
const PROBE = {
  linear: { type: "LINEAR", mhz: 10 },
  curvilinear: { type: "CURVED LINEAR", mhz: 3.5 },
  phased: { type: "SECTOR_PHASED", mhz: 2.5 },
} as const;

/** What a machine writes about the scan besides the pixels; all invented. */
export interface DemoDicomIds {
  studyUid: string;
  sopUid: string;
  operator: string;
}

/** A stable invented UID for a name (2.25 and 128 bits of its hash), so cached files stay consistent. */
export const stableUid = (name: string) => `2.25.${BigInt(`0x${crypto.createHash("sha256").update(name).digest("hex").slice(0, 32)}`)}`;

/** The picture options of a shot, as the library generates it. */
export const imageOf = (s: Shot, name = shotFile(s)): DemoImageOptions => ({
  footprint: s.footprint,
  width: 480,
  height: 360,
  seed: seedOf(name),
  fluid: s.fluid,
  gain: s.gain,
  unusedDepth: s.deep ? 0.4 : 0.05,
  label: labelOf(s),
});

/** A shot as a machine's DICOM export: 30 frames at 15 a second, depth calibrated, invented patient inside. */
export async function demoDicom(s: Shot, image: DemoImageOptions, ids?: DemoDicomIds): Promise<Buffer> {
  const frames = 30;
  return usObject({
    width: image.width,
    height: image.height,
    frames,
    pixels: await demoFrames({ ...image, frames, fps: 15 }),
    frameTimeMs: 66.67,
    depthCm: s.depthCm,
    frequencyMHz: PROBE[s.footprint].mhz,
    transducerType: PROBE[s.footprint].type,
    studyUid: ids?.studyUid ?? demoUid(),
    sopUid: ids?.sopUid ?? demoUid(),
    studyDate: "20261201",
    patient: { name: "Demo^Patient", id: "DEMO-0001", birthDate: "19700101", sex: "O" },
    operator: ids?.operator ?? "Hartwell^Noa",
    institution: "Cedar Hollow Emergency Department",
    accession: "DEMO-ACC-1",
    referringPhysician: "Demo^Referrer",
    privateText: "DEMO PRIVATE NOTE",
  });
}

/** A file that starts like an MP4 but is cut short: the demo's one clip that fails processing. */
export async function brokenClip(dir: string, from: string): Promise<LibraryFile> {
  const out = path.join(dir, "broken.mp4");
  if (!fs.existsSync(out)) {
    const full = await fsp.readFile(from);
    await fsp.writeFile(out, full.subarray(0, Math.floor(full.length / 4)));
  }
  return { path: out, name: "broken.mp4", kind: "video", mime: "video/mp4" };
}
