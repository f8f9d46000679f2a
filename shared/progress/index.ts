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
