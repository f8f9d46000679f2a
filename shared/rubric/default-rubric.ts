// The default rubric, "General image review" version 1. Anchor texts
// are our own wording. The interpretation criterion is recorded as the reviewer's own read
// of each finding, not as a level here.
import type { Criterion } from "./types";
import { PROCEDURE_CODES } from "../catalogue";

const IDEAL = new Set(["suitable", "follows", "fits", "balanced", "standard", "complete", "seen", "under_10s", "4", "5"]);
const lv = (value: string, label: string, anchor: string, fails = false) => ({ value, label, anchor, fails, ideal: IDEAL.has(value) });

export const DEFAULT_RUBRIC_NAME = "General image review";

/** A required, non-critical level criterion for every application unless told otherwise. */
const criterion = (c: Pick<Criterion, "key" | "label" | "help" | "kind" | "levels" | "tolerance"> & Partial<Criterion>): Criterion => ({
  min: null,
  max: null,
  required: true,
  critical: false,
  applications: [],
  ...c,
});

export const DEFAULT_CRITERIA: Criterion[] = [
  criterion({
    key: "transducer",
    label: "Transducer and preset",
    help: "Was the transducer and preset suited to the target and its depth?",
    kind: "ordinal",
    levels: [
      lv("suitable", "Suitable", "The usual transducer and a matching preset for this target and depth."),
      lv("acceptable", "Acceptable", "Workable, though another transducer or preset would have shown the target better."),
      lv("unsuitable", "Unsuitable", "The transducer or preset prevents an adequate image of the target."),
    ],
    tolerance: 1,
  }),
  criterion({
    key: "marker",
    label: "Orientation marker",
    help: "Does the screen orientation follow the convention for this application?",
    kind: "yes_no",
    levels: [
      lv(
        "follows",
        "Follows convention",
        "The marker matches the screen: patient's right in transverse planes, the head in longitudinal planes (or the application's own convention).",
      ),
      lv("does_not", "Does not follow", "The image is flipped or rotated against the convention.", true),
    ],
    critical: true,
    tolerance: 0,
  }),
  criterion({
    key: "depth",
    label: "Depth",
    help: "Does the target fill the screen without wasted depth below it?",
    kind: "choice",
    levels: [
      lv("too_shallow", "Too shallow", "Part of the target or the structures behind it are cut off at the bottom."),
      lv("fits", "Fits the target", "The target fills the screen with little unused depth below it."),
      lv("too_deep", "Too deep", "Much unused depth at the bottom: the target is small and resolution is wasted."),
    ],
    tolerance: 0,
  }),
  criterion({
    key: "gain",
    label: "Gain",
    help: "Is fluid black and tissue shown with its expected brightness?",
    kind: "choice",
    levels: [
      lv("too_low", "Too low", "Tissue is too dark; detail is lost."),
      lv("balanced", "Balanced", "Fluid is anechoic and tissue has its expected echogenicity."),
      lv("too_high", "Too high", "Fluid fills with noise; tissue is washed out."),
    ],
    tolerance: 0,
  }),
  criterion({
    key: "plane",
    label: "Scan plane",
    help: "Was the standard plane for each view obtained?",
    kind: "ordinal",
    levels: [
      lv("standard", "Standard plane", "Each view is in its standard plane with the landmarks shown."),
      lv("partly", "Partly", "Some views are off-plane or miss a landmark."),
      lv("not_obtained", "Not obtained", "The standard planes were not obtained."),
    ],
    tolerance: 1,
  }),
  criterion({
    key: "labels",
    label: "Labeling",
    help: "Are the clips labeled with their views and side?",
    kind: "ordinal",
    levels: [
      lv("complete", "Complete", "Every clip carries its view (and side where it matters)."),
      lv("incomplete", "Incomplete", "Some labels are missing."),
      lv("wrong", "Wrong", "A label names the wrong view or side."),
    ],
    tolerance: 1,
  }),
  criterion({
    key: "quality",
    label: "Overall image quality",
    help: "Could a decision be made from these images?",
    kind: "ordinal",
    levels: [
      lv("1", "1", "No recognizable structures."),
      lv("2", "2", "Structures recognizable, but not enough to decide."),
      lv("3", "3", "The minimum for a decision, with clear flaws."),
      lv("4", "4", "Good, with minor flaws."),
      lv("5", "5", "Excellent."),
    ],
    tolerance: 1,
  }),
  // Technique items of procedures and resuscitation are scored here, never read as findings.
  criterion({
    key: "needle_tip",
    label: "Needle tip seen",
    help: "Was the needle tip followed on screen to the target (in plane, or out of plane by walking the tip)?",
    kind: "yes_no",
    levels: [
      lv("seen", "Seen throughout", "The tip is on screen and identified from entry to the target."),
      lv("lost", "Lost", "The tip leaves the image or the shaft is taken for the tip.", true),
    ],
    tolerance: 0,
    applications: [...PROCEDURE_CODES],
  }),
  criterion({
    key: "pause",
    label: "Pulse-check pause",
    help: "Did image acquisition keep the pause in chest compressions under 10 seconds?",
    kind: "yes_no",
    levels: [
      lv("under_10s", "Under 10 seconds", "The clip is recorded within the pulse check and compressions resume on time."),
      lv("over_10s", "10 seconds or longer", "Scanning lengthened the pause in compressions.", true),
    ],
    tolerance: 0,
    applications: ["cardiac_arrest"],
  }),
];
