// Raw (not chance-corrected) agreement between reviewers.
//
// Definition: for each unit with r ≥ 2 ratings, the share of the r(r − 1)/2 rater pairs
// that gave the same category, Σ_k r_k(r_k − 1) / (r(r − 1)); the value is the unweighted
// mean of these shares over such units (the observed agreement P̄ of Fleiss 1971,
// generalised to unequal numbers of ratings). With two raters it is simply the share of
// units on which both agree. Units with fewer than two ratings carry no pair and are
// skipped; if none is left the value is null.

import { codeMatrix, groupUnits } from "./matrix";
import type { Category, PercentAgreementResult, RatingsMatrix } from "./types";

/**
 * Mean per-unit share of agreeing rater pairs (units with at least two ratings).
 * `multiplicity` (optional): how many identical units each row stands for.
 */
export function percentAgreement(
  matrix: RatingsMatrix,
  options: { categories?: readonly Category[]; multiplicity?: readonly number[] } = {},
): PercentAgreementResult {
  const g = groupUnits(codeMatrix(matrix, "percentAgreement", options.categories, options.multiplicity));
  let sum = 0;
  let units = 0;
  g.counts.forEach((c, i) => {
    const r = g.totals[i];
    if (r < 2) return;
    sum += (g.weights[i] * c.reduce((s, x) => s + x * (x - 1), 0)) / (r * (r - 1));
    units += g.weights[i];
  });
  if (units === 0) return { value: null, units: 0, reason: "no unit has ratings from two or more raters" };
  return { value: sum / units, units };
}
