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
//
// Alpha depends on a unit only through its vector of category counts, so units are
// grouped by that vector first (matrix.ts, groupUnits) and every sum runs over the
// groups. A bootstrap resample of N units then is a multinomial draw of how many times
// each group is picked — N uniform picks of a unit, counted per group, have exactly this
// distribution — drawn as a chain of binomials (group g gets Binomial(N − picked so far,
// w_g / units in the groups not yet drawn)). The cost per resample follows the number of
// distinct vectors, not the number of units. Groups come in an order fixed by the data,
// so the same units give the same interval for a seed whatever their row order and
// whether they arrive as rows or as grouped rows with multiplicities.

import { binomialDraw, mulberry32 } from "./random";
import { categoryValues, codeMatrix, groupUnits } from "./matrix";
import type { AlphaResult, Category, Interval, RatingsMatrix } from "./types";

export type AlphaLevel = "nominal" | "ordinal" | "interval" | "ratio";

export interface AlphaOptions {
  level: AlphaLevel;
  /** Order of ordinal categories (else numeric / natural order); ranks serve as values for interval/ratio on labels. */
  categories?: readonly Category[];
  bootstrap?: { samples: number; seed?: number };
  /** How many identical units each row stands for; the result (bootstrap included) equals that of the matrix with each row repeated so often. */
  multiplicity?: readonly number[];
}

const LEVELS: readonly AlphaLevel[] = ["nominal", "ordinal", "interval", "ratio"];

/** Krippendorff's alpha at the given level of measurement, missing ratings allowed. */
export function krippendorffAlpha(matrix: RatingsMatrix, options: AlphaOptions): AlphaResult {
  const level = options?.level;
  if (!LEVELS.includes(level)) throw new Error(`krippendorffAlpha: level must be one of ${LEVELS.join(", ")} (got ${String(level)})`);
  const boot = options.bootstrap;
  if (boot !== undefined && (!Number.isInteger(boot.samples) || boot.samples < 1 || boot.samples > 1_000_000))
    throw new RangeError(`krippendorffAlpha: bootstrap.samples must be an integer from 1 to 1000000 (got ${String(boot.samples)})`);
  const p = codeMatrix(matrix, "krippendorffAlpha", options.categories, options.multiplicity);
  const q = p.keys.length;
  let values: number[] = [];
  if (level === "interval" || level === "ratio") {
    values = q === 0 ? [] : categoryValues(p, "krippendorffAlpha");
    if (level === "ratio" && values.some((v) => v < 0)) throw new Error("krippendorffAlpha: the ratio level needs non-negative values");
  }
  const all = groupUnits(p);
  // The pairable groups (m_u ≥ 2) and each one's contribution to the coincidence matrix,
  // flattened into one array: group g's row a, column b at (g·q + a)·q + b.
  const weight: number[] = [];
  let units = 0;
  let pairableValues = 0;
  const pairable: number[] = [];
  all.totals.forEach((m, g) => {
    if (m < 2) return;
    pairable.push(g);
    weight.push(all.weights[g]);
    units += all.weights[g];
    pairableValues += all.weights[g] * m;
  });
  if (units < 2) return { value: null, units, pairableValues, reason: "fewer than two units have ratings from two or more raters" };
  const G = pairable.length;
  const qq = q * q;
  // Each pairable group's contribution to the coincidence matrix, kept sparse (a unit with
  // m values touches at most m² cells, whatever the number of categories): group i's
  // cells are cell[start[i]] … cell[start[i + 1] − 1] with values share[…].
  const start = new Int32Array(G + 1);
  const cell: number[] = [];
  const share: number[] = [];
  pairable.forEach((g, i) => {
    const c = all.counts[g];
    const m = all.totals[g];
    for (let a = 0; a < q; a++) {
      if (c[a] === 0) continue;
      for (let b = 0; b < q; b++) {
        const v = c[a] * (a === b ? c[a] - 1 : c[b]);
        if (v === 0) continue;
        cell.push(a * q + b);
        share.push(v / (m - 1));
      }
    }
    start[i + 1] = cell.length;
  });

  // Fixed distances for nominal, interval and ratio; ordinal ones depend on the
  // marginals of each (resampled) coincidence matrix and are filled per call.
  const delta = new Float64Array(qq);
  if (level !== "ordinal")
    for (let a = 0; a < q; a++)
      for (let b = 0; b < q; b++) {
        if (a === b) continue;
        if (level === "nominal") delta[a * q + b] = 1;
        else if (level === "interval") delta[a * q + b] = (values[a] - values[b]) ** 2;
        else {
          const sum = values[a] + values[b];
          delta[a * q + b] = sum === 0 ? 0 : ((values[a] - values[b]) / sum) ** 2;
        }
      }

  const o = new Float64Array(qq);
  const marg = new Float64Array(q);
  /** Alpha of the units picked `times[i]` times from pairable group i. */
  const alphaOf = (times: ArrayLike<number>): number | null => {
    o.fill(0);
    for (let i = 0; i < G; i++) {
      const t = times[i];
      if (t === 0) continue;
      for (let e = start[i]; e < start[i + 1]; e++) o[cell[e]] += t * share[e];
    }
    marg.fill(0);
    let n = 0;
    for (let a = 0; a < q; a++)
      for (let b = 0; b < q; b++) {
        marg[a] += o[a * q + b];
        n += o[a * q + b];
      }
    if (level === "ordinal") {
      // δ²_ck = (Σ_{g=c..k} n_g − (n_c + n_k)/2)².
      for (let a = 0; a < q; a++)
        for (let b = 0; b < q; b++) {
          if (a === b) continue;
          const lo = Math.min(a, b);
          const hi = Math.max(a, b);
          let s = 0;
          for (let g = lo; g <= hi; g++) s += marg[g];
          const d = s - (marg[a] + marg[b]) / 2;
          delta[a * q + b] = d * d;
        }
    }
    let observed = 0;
    let expected = 0;
    for (let a = 0; a < q; a++)
      for (let b = 0; b < q; b++) {
        if (a === b) continue;
        const d = delta[a * q + b];
        observed += o[a * q + b] * d;
        expected += marg[a] * marg[b] * d;
      }
    // Relative threshold: expected disagreement is a sum of non-negative terms, so a
    // value that is zero up to rounding means every pairable value is the same.
    if (!(expected > 1e-12 * n * n)) return null;
    return 1 - ((n - 1) * observed) / expected;
  };

  const value = alphaOf(weight);
  if (value === null) return { value: null, units, pairableValues, reason: "all pairable ratings are identical; alpha is undefined (no variation)" };
  const result: AlphaResult = { value, units, pairableValues };
  if (boot !== undefined) {
    const seed = boot.seed ?? 1;
    const rand = mulberry32(seed);
    const draws: number[] = [];
    const times = new Float64Array(G);
    for (let s = 0; s < boot.samples; s++) {
      // Multinomial(units; w_g / units) as a chain of binomials.
      let left = units;
      let rest = units;
      for (let i = 0; i < G; i++) {
        const t = i === G - 1 ? left : left === 0 ? 0 : binomialDraw(left, weight[i] / rest, rand);
        times[i] = t;
        left -= t;
        rest -= weight[i];
      }
      const a = alphaOf(times);
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
