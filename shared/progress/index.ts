// Learner progress arithmetic (README "Progress and credentialing"), pure and shared by server and screens:
// attainment per criterion, rolling means, and accuracy with Wilson intervals.
import type { Criterion, ScoreValue } from "../rubric/types";
import type { Accuracy, Rate } from "../schemas/progress";
import { wilsonInterval } from "../stats/wilson";

/**
 * How close a score is to what the program aims for, from 0 (furthest) to 1 (an ideal
 * level). For level criteria the distance is counted in level steps to the nearest ideal
 * level and scaled by the largest such distance in the criterion, so "Partly" on a
 * three-level plane scores 0.5 and "Too deep" on depth scores 0. A criterion without ideal
 * levels, or a number criterion without a range, gives null (no trend is drawn for it).
 */
export function criterionAttainment(c: Criterion, value: ScoreValue | null | undefined): number | null {
  if (value === null || value === undefined || value === "") return null;
  if (c.kind === "number") {
    if (c.min === null || c.max === null || c.max === c.min) return null;
    const v = Number(value);
    if (!Number.isFinite(v)) return null;
    return Math.min(1, Math.max(0, (v - c.min) / (c.max - c.min)));
  }
  const ideals = c.levels.flatMap((l, i) => (l.ideal ? [i] : []));
  const index = c.levels.findIndex((l) => l.value === String(value));
  if (ideals.length === 0 || index < 0) return null;
  const distance = (i: number) => Math.min(...ideals.map((j) => Math.abs(i - j)));
  const worst = Math.max(...c.levels.map((_, i) => distance(i)));
  if (worst === 0) return 1;
  // A choice criterion (depth, gain) has no order between its off-target levels: any miss is 0.
  if (c.kind === "choice" || c.kind === "yes_no") return distance(index) === 0 ? 1 : 0;
  return 1 - distance(index) / worst;
}

/** Trailing mean over the last `window` values (fewer at the start of the series). */
export function rollingMean(values: readonly number[], window: number): number[] {
  if (!Number.isInteger(window) || window < 1) throw new RangeError("rollingMean: window must be a positive integer");
  const out: number[] = [];
  let sum = 0;
  values.forEach((v, i) => {
    sum += v;
    if (i >= window) sum -= values[i - window];
    out.push(sum / Math.min(i + 1, window));
  });
  return out;
}

/** A proportion with its Wilson 95% interval; value null when there is nothing to count. */
export function rate(successes: number, n: number): Rate {
  return { successes, n, value: n === 0 ? null : successes / n, ci95: wilsonInterval(successes, n) };
}

export interface OutcomeCounts {
  tp: number;
  fp: number;
  tn: number;
  fn: number;
  indeterminate: number;
}

/** Sensitivity, specificity, PPV and NPV from a 2×2 table (standard definitions). */
export function accuracyFrom({ tp, fp, tn, fn, indeterminate }: OutcomeCounts): Accuracy {
  return {
    tp,
    fp,
    tn,
    fn,
    indeterminate,
    sensitivity: rate(tp, tp + fn),
    specificity: rate(tn, tn + fp),
    ppv: rate(tp, tp + fp),
    npv: rate(tn, tn + fn),
  };
}

type Read = "positive" | "negative" | "indeterminate";

/** Classifies a read against a reference read (positive = the finding is present). */
export function classify(read: Read, reference: Read): keyof OutcomeCounts {
  if (read === "indeterminate" || reference === "indeterminate") return "indeterminate";
  if (read === "positive") return reference === "positive" ? "tp" : "fp";
  return reference === "negative" ? "tn" : "fn";
}

/** Counts a list of read/reference pairs into a 2×2 table plus indeterminate. */
export function countOutcomes(pairs: Iterable<{ read: Read; reference: Read }>): OutcomeCounts {
  const counts: OutcomeCounts = { tp: 0, fp: 0, tn: 0, fn: 0, indeterminate: 0 };
  for (const p of pairs) counts[classify(p.read, p.reference)] += 1;
  return counts;
}

/** One reviewed exam as the credit rule counts it. */
export interface CountedExam {
  setting: "clinical" | "educational" | "simulated";
  credit: boolean;
  /** Marked technically limited by patient factors: no credit, and not a failure. */
  limited: boolean;
  /** The final read has at least one positive finding. */
  positive: boolean;
}

export interface ThresholdRule {
  /** Credited exams needed. */
  threshold: number;
  /** The most educational and simulated credited exams that count toward it (null: no cap). */
  nonClinicalCap: number | null;
  /** Credited exams with a positive finding needed. */
  minPositive: number;
}

export interface ThresholdCount {
  credited: number;
  creditedBySetting: Record<CountedExam["setting"], number>;
  /** Credited exams that count toward the threshold: every clinical one, and educational and simulated ones up to the cap. */
  counted: number;
  /** Credited exams with a positive finding. */
  positives: number;
  limited: number;
  remaining: number;
  met: boolean;
}

/**
 * The credit rule of an application over a clinician's reviewed exams. Clinical credited exams
 * all count; educational and simulated ones together count up to the cap. The threshold is
 * met when enough exams count and at least `minPositive` credited exams had a positive finding.
 */
export function countTowardThreshold(exams: readonly CountedExam[], rule: ThresholdRule): ThresholdCount {
  const credited = exams.filter((e) => e.credit);
  const creditedBySetting = { clinical: 0, educational: 0, simulated: 0 };
  for (const e of credited) creditedBySetting[e.setting] += 1;
  const nonClinical = creditedBySetting.educational + creditedBySetting.simulated;
  const counted = creditedBySetting.clinical + (rule.nonClinicalCap === null ? nonClinical : Math.min(rule.nonClinicalCap, nonClinical));
  const positives = credited.filter((e) => e.positive).length;
  return {
    credited: credited.length,
    creditedBySetting,
    counted,
    positives,
    limited: exams.filter((e) => e.limited).length,
    remaining: Math.max(0, rule.threshold - counted),
    met: counted >= rule.threshold && positives >= rule.minPositive,
  };
}

/** The rule in words, as reports state it. */
export function describeThresholdRule(rule: ThresholdRule & { requireComplete: boolean }, minQuality: number): string {
  const parts = [`${rule.threshold} credited exams`];
  parts.push(
    rule.nonClinicalCap === null ? "educational and simulated exams count without a cap" : `at most ${rule.nonClinicalCap} of them educational or simulated`,
  );
  if (rule.minPositive > 0) parts.push(`at least ${rule.minPositive} with a positive finding`);
  const credit = [
    `overall image quality at least ${minQuality}`,
    "no critical criterion failing",
    "no misread finding (any setting)",
    ...(rule.requireComplete ? ["a clip of every required view"] : []),
  ];
  return `${parts.join("; ")}. An exam earns credit with ${credit.join(", ")}; a study marked technically limited by patient factors earns none and is not a failure.`;
}
