// Chance-corrected agreement for categorical scores: Cohen's kappa for a pair of
// reviewers (optionally weighted for ordinal scales) and Fleiss' kappa for several
// reviewers with missing ratings allowed.

import { normalQuantile } from "./distributions";
import { codeMatrix, groupUnits, type UnitGroups } from "./matrix";
import type { Category, Interval, KappaResult, RatingsMatrix } from "./types";

export type KappaWeights = "unweighted" | "linear" | "quadratic";

export interface CohensKappaOptions {
  weights?: KappaWeights;
  /** Category order (needed for weighted kappa on string labels); unused categories are allowed. */
  categories?: readonly Category[];
  /** How many identical units each row stands for (e.g. counted rating pairs); the result equals that of the matrix with each row repeated so often. */
  multiplicity?: readonly number[];
}

/** Options of the multi-rater coefficients (Fleiss' kappa, Gwet's AC1). */
export interface MultiRaterOptions {
  categories?: readonly Category[];
  /** How many identical units each row stands for; the result equals that of the matrix with each row repeated so often. */
  multiplicity?: readonly number[];
}

// 1 − pe below this is treated as 0: chance agreement is then total (one category used)
// and kappa is 0/0.
const DEGENERATE = 1e-12;

let z975: number | undefined;
/** z(0.975), computed once. */
export function z95(): number {
  if (z975 === undefined) z975 = normalQuantile(0.975);
  return z975;
}

/** value ± z·se clipped to [-1, 1], the range of kappa-type coefficients. */
export function kappaInterval(value: number, se: number): Interval {
  const z = z95();
  return [Math.max(-1, value - z * se), Math.min(1, value + z * se)];
}

export function nullKappa(units: number, reason: string): KappaResult {
  return { value: null, se: null, ci95: null, units, reason };
}

/**
 * Cohen's kappa for exactly two raters; rows with a missing rating are dropped.
 *
 * Weights are agreement weights on category positions i, j (0-based, k categories):
 * linear 1 − |i − j|/(k − 1), quadratic 1 − (i − j)²/(k − 1)² (Cohen 1968; Fleiss &
 * Cohen 1973). The standard error is the large-sample (non-null) one of Fleiss, Cohen &
 * Everitt (1969):
 *   var = [Σ_ij p_ij (w_ij − (w̄_i. + w̄_.j)(1 − κ))² − (κ − pe(1 − κ))²] / (n (1 − pe)²),
 * with w̄_i. = Σ_j w_ij p_.j and w̄_.j = Σ_i w_ij p_i.
 */
export function cohensKappa(matrix: RatingsMatrix, options: CohensKappaOptions = {}): KappaResult {
  const weights = options.weights ?? "unweighted";
  if (weights !== "unweighted" && weights !== "linear" && weights !== "quadratic")
    throw new Error(`cohensKappa: weights must be "unweighted", "linear" or "quadratic" (got ${String(weights)})`);
  const p = codeMatrix(matrix, "cohensKappa", options.categories, options.multiplicity);
  if (p.units === 0) return nullKappa(0, "no units");
  if (p.raters !== 2) throw new Error(`cohensKappa: needs exactly 2 rater columns, got ${p.raters}`);
  const k = p.keys.length;
  const table = Array.from({ length: k }, () => new Array<number>(k).fill(0));
  let n = 0;
  for (let i = 0; i < p.rows; i++) {
    const a = p.codes[2 * i];
    const b = p.codes[2 * i + 1];
    if (a < 0 || b < 0) continue;
    const w = p.weights === null ? 1 : p.weights[i];
    table[a][b] += w;
    n += w;
  }
  if (n < 2) return nullKappa(n, "fewer than two units were rated by both raters");
  const w = (i: number, j: number): number => {
    if (weights === "unweighted" || k === 1) return i === j ? 1 : 0;
    const d = Math.abs(i - j) / (k - 1);
    return weights === "linear" ? 1 - d : 1 - d * d;
  };
  const row = new Array<number>(k).fill(0);
  const col = new Array<number>(k).fill(0);
  for (let i = 0; i < k; i++)
    for (let j = 0; j < k; j++) {
      row[i] += table[i][j] / n;
      col[j] += table[i][j] / n;
    }
  let po = 0;
  let pe = 0;
  for (let i = 0; i < k; i++)
    for (let j = 0; j < k; j++) {
      po += (w(i, j) * table[i][j]) / n;
      pe += w(i, j) * row[i] * col[j];
    }
  if (1 - pe < DEGENERATE) return nullKappa(n, "chance agreement is 1 (both raters used one and the same category); kappa is undefined");
  const kappa = (po - pe) / (1 - pe);
  const wRow = row.map((_, i) => col.reduce((s, c, j) => s + w(i, j) * c, 0));
  const wCol = col.map((_, j) => row.reduce((s, r, i) => s + w(i, j) * r, 0));
  let sum = 0;
  for (let i = 0; i < k; i++)
    for (let j = 0; j < k; j++) {
      if (table[i][j] === 0) continue;
      const t = w(i, j) - (wRow[i] + wCol[j]) * (1 - kappa);
      sum += (table[i][j] / n) * t * t;
    }
  const c = kappa - pe * (1 - kappa);
  const variance = Math.max(0, (sum - c * c) / (n * (1 - pe) * (1 - pe)));
  const se = Math.sqrt(variance);
  return { value: kappa, se, ci95: kappaInterval(kappa, se), units: n };
}

/**
 * Shared multi-rater machinery of Gwet (2008; 2014, Handbook of Inter-Rater
 * Reliability, 4th ed.): observed agreement over units with ≥ 2
 * ratings, category shares π_k averaged over units with ≥ 1 rating, and the linearised
 * variance (1/(n(n − 1))) Σ_i (c*_i − c)² with
 *   c_i  = (n / n2)(pa_i − pe·[r_i ≥ 2]) / (1 − pe)
 *   c*_i = c_i − 2(1 − c)(pe_i − pe) / (1 − pe)
 * (sampling fraction taken as 0, i.e. units are a sample from a large population).
 * Units come grouped by count vector; each sum over units is a weighted sum over groups.
 */
export function multiRaterCoefficient(
  groups: UnitGroups,
  q: number,
  chance: (pi: number[]) => { pe: number; peUnit: (count: number[], total: number) => number },
): { value: number; se: number; pe: number; units: number } | { value: null; reason: string; units: number } {
  const { counts, totals, weights } = groups;
  let n = 0;
  let n2 = 0;
  for (let g = 0; g < counts.length; g++) {
    n += weights[g];
    if (totals[g] >= 2) n2 += weights[g];
  }
  if (n2 < 2) return { value: null, reason: "fewer than two units have ratings from two or more raters", units: n2 };
  const pi = new Array<number>(q).fill(0);
  for (let g = 0; g < counts.length; g++) for (let k = 0; k < q; k++) pi[k] += (weights[g] * (counts[g][k] / totals[g])) / n;
  const paUnit = counts.map((c, g) => (totals[g] >= 2 ? c.reduce((s, x) => s + x * (x - 1), 0) / (totals[g] * (totals[g] - 1)) : 0));
  const pa = paUnit.reduce((s, x, g) => s + weights[g] * x, 0) / n2;
  const { pe, peUnit } = chance(pi);
  if (1 - pe < DEGENERATE) return { value: null, reason: "chance agreement is 1 (a single category was used); the coefficient is undefined", units: n2 };
  const value = (pa - pe) / (1 - pe);
  let ss = 0;
  counts.forEach((c, g) => {
    const r = totals[g];
    const ci = ((n / n2) * (paUnit[g] - (r >= 2 ? pe : 0))) / (1 - pe);
    const star = ci - (2 * (1 - value) * (peUnit(c, r) - pe)) / (1 - pe);
    ss += weights[g] * (star - value) * (star - value);
  });
  return { value, se: Math.sqrt(ss / (n * (n - 1))), pe, units: n };
}

/**
 * Fleiss' kappa (Fleiss 1971) for any number of raters. With missing ratings it is the
 * generalisation of Gwet (2014): pa over units with ≥ 2 ratings, pe = Σ_k π_k²; with
 * complete data this equals Fleiss' original statistic. SE as in multiRaterCoefficient,
 * with pe_i = Σ_k (r_ik / r_i) π_k.
 */
export function fleissKappa(matrix: RatingsMatrix, options: MultiRaterOptions = {}): KappaResult {
  const p = codeMatrix(matrix, "fleissKappa", options.categories, options.multiplicity);
  if (p.units === 0 || p.keys.length === 0) return nullKappa(0, "no ratings");
  const res = multiRaterCoefficient(groupUnits(p), p.keys.length, (pi) => ({
    pe: pi.reduce((s, x) => s + x * x, 0),
    peUnit: (c, r) => c.reduce((s, x, k) => s + (x / r) * pi[k], 0),
  }));
  if (res.value === null) return nullKappa(res.units, res.reason);
  return { value: res.value, se: res.se, ci95: kappaInterval(res.value, res.se), units: res.units };
}
