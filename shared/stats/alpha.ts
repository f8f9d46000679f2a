// Krippendorff's alpha: chance-corrected agreement for any number of raters, any
// measurement level and missing ratings — the coefficient that fits review data where
// not every reviewer sees every exam. Computed through the coincidence matrix as in
// Krippendorff (2011, "Computing Krippendorff's Alpha-Reliability"):
//
//   o_ck = Σ_u Σ_{i≠j in u} [v_i = c][v_j = k] / (m_u − 1)     (units with m_u ≥ 2 values)
//   n_c  = Σ_k o_ck,  n = Σ_c n_c
//   α    = 1 − (n − 1) Σ_ck o_ck δ²_ck / Σ_ck n_c n_k δ²_ck
//
// Metrics δ²: nominal [c ≠ k]; ordinal (Σ_{g=c..k} n_g − (n_c + n_k)/2)² over the category
// order; interval (c − k)²; ratio ((c − k)/(c + k))².
//
// The optional interval is a percentile bootstrap over units (units with ≥ 2 ratings are
// resampled with replacement, alpha recomputed, the 2.5th and 97.5th percentiles taken
// with linear interpolation). It is NOT Hayes & Krippendorff's (2007) algorithm, which
// resamples pairs of values; resampling whole units keeps each exam's reviewers together.
// Resamples without variation (alpha undefined) are skipped and counted; if fewer than
// half are usable no interval is given.

import { mulberry32 } from "./random";
import { categoryValues, prepareMatrix, unitCounts } from "./matrix";
import type { AlphaResult, Category, Interval, RatingsMatrix } from "./types";

export type AlphaLevel = "nominal" | "ordinal" | "interval" | "ratio";

export interface AlphaOptions {
  level: AlphaLevel;
  /** Order of ordinal categories (else numeric / natural order); ranks serve as values for interval/ratio on labels. */
  categories?: readonly Category[];
  bootstrap?: { samples: number; seed?: number };
}

const LEVELS: readonly AlphaLevel[] = ["nominal", "ordinal", "interval", "ratio"];

/** Krippendorff's alpha at the given level of measurement, missing ratings allowed. */
export function krippendorffAlpha(matrix: RatingsMatrix, options: AlphaOptions): AlphaResult {
  const level = options?.level;
  if (!LEVELS.includes(level)) throw new Error(`krippendorffAlpha: level must be one of ${LEVELS.join(", ")} (got ${String(level)})`);
  const boot = options.bootstrap;
  if (boot !== undefined && (!Number.isInteger(boot.samples) || boot.samples < 1 || boot.samples > 1_000_000))
    throw new RangeError(`krippendorffAlpha: bootstrap.samples must be an integer from 1 to 1000000 (got ${String(boot.samples)})`);
  const p = prepareMatrix(matrix, "krippendorffAlpha", options.categories);
  const q = p.keys.length;
  let values: number[] = [];
  if (level === "interval" || level === "ratio") {
    values = q === 0 ? [] : categoryValues(p, "krippendorffAlpha");
    if (level === "ratio" && values.some((v) => v < 0)) throw new Error("krippendorffAlpha: the ratio level needs non-negative values");
  }
  const { counts, totals } = unitCounts(p);
  // Each pairable unit's contribution to the coincidence matrix, flattened, so that a
  // bootstrap resample is just a sum of precomputed rows.
  const contributions: Float64Array[] = [];
  counts.forEach((c, u) => {
    const m = totals[u];
    if (m < 2) return;
    const o = new Float64Array(q * q);
    for (let a = 0; a < q; a++) {
      if (c[a] === 0) continue;
      for (let b = 0; b < q; b++) o[a * q + b] = (c[a] * (a === b ? c[a] - 1 : c[b])) / (m - 1);
    }
    contributions.push(o);
  });
  const units = contributions.length;
  const pairableValues = totals.reduce((s, m) => s + (m >= 2 ? m : 0), 0);
  if (units < 2) return { value: null, units, pairableValues, reason: "fewer than two units have ratings from two or more raters" };

  const delta = (a: number, b: number, marg: Float64Array): number => {
    if (a === b) return 0;
    switch (level) {
      case "nominal":
        return 1;
      case "ordinal": {
        const lo = Math.min(a, b);
        const hi = Math.max(a, b);
        let s = 0;
        for (let g = lo; g <= hi; g++) s += marg[g];
        const d = s - (marg[a] + marg[b]) / 2;
        return d * d;
      }
      case "interval": {
        const d = values[a] - values[b];
        return d * d;
      }
      case "ratio": {
        const sum = values[a] + values[b];
        if (sum === 0) return 0;
        const d = (values[a] - values[b]) / sum;
        return d * d;
      }
    }
  };

  const o = new Float64Array(q * q);
  const marg = new Float64Array(q);
  const alphaOf = (pick: (i: number) => Float64Array): number | null => {
    o.fill(0);
    for (let i = 0; i < units; i++) {
      const row = pick(i);
      for (let j = 0; j < q * q; j++) o[j] += row[j];
    }
    marg.fill(0);
    let n = 0;
    for (let a = 0; a < q; a++)
      for (let b = 0; b < q; b++) {
        marg[a] += o[a * q + b];
        n += o[a * q + b];
      }
    let observed = 0;
    let expected = 0;
    for (let a = 0; a < q; a++)
      for (let b = 0; b < q; b++) {
        if (a === b) continue;
        const d = delta(a, b, marg);
        observed += o[a * q + b] * d;
        expected += marg[a] * marg[b] * d;
      }
    // Relative threshold: expected disagreement is a sum of non-negative terms, so a
    // value that is zero up to rounding means every pairable value is the same.
    if (!(expected > 1e-12 * n * n)) return null;
    return 1 - ((n - 1) * observed) / expected;
  };

  const value = alphaOf((i) => contributions[i]);
  if (value === null) return { value: null, units, pairableValues, reason: "all pairable ratings are identical; alpha is undefined (no variation)" };
  const result: AlphaResult = { value, units, pairableValues };
  if (boot !== undefined) {
    const seed = boot.seed ?? 1;
    const rand = mulberry32(seed);
    const draws: number[] = [];
    for (let s = 0; s < boot.samples; s++) {
      const picks = Array.from({ length: units }, () => contributions[Math.floor(rand() * units)]);
      const a = alphaOf((i) => picks[i]);
      if (a !== null) draws.push(a);
    }
    result.bootstrap = { samples: boot.samples, used: draws.length, seed };
    if (draws.length >= 2 && draws.length >= boot.samples / 2) {
      draws.sort((x, y) => x - y);
      result.ci95 = [percentile(draws, 0.025), percentile(draws, 0.975)] as Interval;
    } else {
      result.reason = "too few bootstrap resamples had variation to give an interval";
    }
  }
  return result;
}

// Linear interpolation between order statistics (Hyndman & Fan 1996, type 7).
function percentile(sorted: number[], prob: number): number {
  const h = (sorted.length - 1) * prob;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, sorted.length - 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}
