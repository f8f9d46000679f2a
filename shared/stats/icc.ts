// Intraclass correlation for numeric scores (e.g. summed checklist totals) given by
// several reviewers, with the F-based 95% intervals of McGraw & Wong (1996).
//
// Models (Shrout & Fleiss 1979 / McGraw & Wong 1996 names):
//   "oneway"        ICC(1,1) / ICC(1,k)  — each unit rated by a different set of raters
//   "twoway-random" ICC(2,1) / ICC(2,k)  = ICC(A,1) / ICC(A,k): raters a random sample,
//                   absolute agreement (rater bias counts as disagreement)
//   "twoway-mixed"  ICC(3,1) / ICC(3,k)  = ICC(C,1) / ICC(C,k): these raters only,
//                   consistency (a constant rater offset is ignored)
// Rows with a missing rating are dropped (complete units only). Mean squares are from
// the two-way ANOVA without replication: MSR (units), MSC (raters), MSE (residual) and
// MSW (within units, one-way).
//
// Degenerate data: fewer than two complete units or raters, or no variance at all, give
// value null with a reason. When the rating differences that count as error are all zero
// while units differ, the value is 1 with interval [1, 1].

import { fQuantile } from "./distributions";
import { checkShape } from "./matrix";
import type { IccResult, Interval, RatingsMatrix } from "./types";

export type IccModel = "oneway" | "twoway-random" | "twoway-mixed";
export type IccUnit = "single" | "average";

const ALPHA = 0.05;
// Degrees of freedom beyond this are treated as this value: the F quantile is then
// within ~1e-7 of its limit and the continued fraction stays fast.
const MAX_DF = 1e7;

/** Intraclass correlation with its 95% F-based interval (McGraw & Wong 1996). */
export function icc(matrix: RatingsMatrix, options: { model: IccModel; unit: IccUnit }): IccResult {
  const model = options?.model;
  const unit = options?.unit;
  if (model !== "oneway" && model !== "twoway-random" && model !== "twoway-mixed")
    throw new Error(`icc: model must be "oneway", "twoway-random" or "twoway-mixed" (got ${String(model)})`);
  if (unit !== "single" && unit !== "average") throw new Error(`icc: unit must be "single" or "average" (got ${String(unit)})`);
  const shape = checkShape(matrix, "icc");
  matrix.forEach((row, i) =>
    row.forEach((v, j) => {
      if (v !== null && typeof v !== "number") throw new TypeError(`icc: rating at row ${i}, column ${j} is not a number`);
    }),
  );
  const k = shape.raters;
  const rows = matrix.filter((row) => row.every((v) => v !== null)) as number[][];
  const n = rows.length;
  const base = { units: n, raters: k };
  if (k < 2) return { ...base, value: null, ci95: null, reason: "at least two raters are needed" };
  if (n < 2) return { ...base, value: null, ci95: null, reason: "fewer than two units were rated by every rater" };

  const grand = rows.reduce((s, r) => s + r.reduce((a, b) => a + b, 0), 0) / (n * k);
  const rowMean = rows.map((r) => r.reduce((a, b) => a + b, 0) / k);
  const colMean = Array.from({ length: k }, (_, j) => rows.reduce((s, r) => s + r[j], 0) / n);
  let ssr = 0;
  let ssc = 0;
  let ssw = 0;
  let sse = 0;
  for (let i = 0; i < n; i++) ssr += k * (rowMean[i] - grand) ** 2;
  for (let j = 0; j < k; j++) ssc += n * (colMean[j] - grand) ** 2;
  // Residuals computed directly rather than by subtraction so that perfect agreement
  // gives exactly zero instead of ±1e-16.
  for (let i = 0; i < n; i++)
    for (let j = 0; j < k; j++) {
      ssw += (rows[i][j] - rowMean[i]) ** 2;
      sse += (rows[i][j] - rowMean[i] - colMean[j] + grand) ** 2;
    }
  const scale = Math.max(ssr, ssc, ssw, 1e-300);
  const zero = (x: number): number => (x <= 1e-13 * scale ? 0 : x);
  const msr = zero(ssr) / (n - 1);
  const msc = zero(ssc) / (k - 1);
  const msw = zero(ssw) / (n * (k - 1));
  const mse = zero(sse) / ((n - 1) * (k - 1));
  const noVariance = { ...base, value: null, ci95: null, reason: "the ratings have no variance; the ICC is undefined" };
  const noUnitVariance = {
    ...base,
    value: null,
    ci95: null,
    reason: "units do not differ (no between-unit variance); the average-measure ICC is undefined",
  };

  if (model === "oneway" || model === "twoway-mixed") {
    // One F-ratio design: oneway uses MSW with n(k − 1) df, consistency uses MSE with
    // (n − 1)(k − 1) df (McGraw & Wong 1996, Table 7, cases 1 and 3).
    const err = model === "oneway" ? msw : mse;
    const df2 = model === "oneway" ? n * (k - 1) : (n - 1) * (k - 1);
    if (msr === 0 && err === 0) return noVariance;
    if (err === 0) return { ...base, value: 1, ci95: [1, 1] };
    if (unit === "average" && msr === 0) return noUnitVariance;
    const fObs = msr / err;
    const fl = fObs / fQuantile(1 - ALPHA / 2, n - 1, df2);
    const fu = fObs * fQuantile(1 - ALPHA / 2, df2, n - 1);
    if (unit === "single") {
      const value = (msr - err) / (msr + (k - 1) * err);
      return { ...base, value, ci95: [(fl - 1) / (fl + k - 1), (fu - 1) / (fu + k - 1)] };
    }
    const value = (msr - err) / msr;
    return { ...base, value, ci95: [1 - 1 / fl, 1 - 1 / fu] };
  }

  // Two-way random, absolute agreement (McGraw & Wong 1996, Table 7, case 2A), with
  // Satterthwaite degrees of freedom v for the denominator.
  const den1 = msr + (k - 1) * mse + (k * (msc - mse)) / n;
  if (!(den1 > 0) || (msr === 0 && mse === 0)) return noVariance;
  if (mse === 0 && msc === 0) return { ...base, value: 1, ci95: [1, 1] };
  const rho = (msr - mse) / den1;
  let value: number;
  if (unit === "single") value = rho;
  else {
    const den = msr + (msc - mse) / n;
    if (!(den > 0)) return noUnitVariance;
    value = (msr - mse) / den;
  }
  const a = (k * rho) / (n * (1 - rho));
  const b = 1 + (k * rho * (n - 1)) / (n * (1 - rho));
  const v = (a * msc + b * mse) ** 2 / ((a * msc) ** 2 / (k - 1) + (b * mse) ** 2 / ((n - 1) * (k - 1)));
  if (!(v > 0) || !Number.isFinite(v)) return { ...base, value, ci95: null, reason: "the approximate degrees of freedom for the interval are undefined" };
  const vv = Math.min(v, MAX_DF);
  const fStar = fQuantile(1 - ALPHA / 2, n - 1, vv);
  const fStarUpper = fQuantile(1 - ALPHA / 2, vv, n - 1);
  const lower = (n * (msr - fStar * mse)) / (fStar * (k * msc + (k * n - k - n) * mse) + n * msr);
  const upper = (n * (fStarUpper * msr - mse)) / (k * msc + (k * n - k - n) * mse + n * fStarUpper * msr);
  // The average-measure limits are the Spearman–Brown step-up of the single-measure
  // limits, which is algebraically McGraw & Wong's case 2A average formula.
  const ci95: Interval = unit === "single" ? [lower, upper] : [(k * lower) / (1 + (k - 1) * lower), (k * upper) / (1 + (k - 1) * upper)];
  return { ...base, value, ci95 };
}
