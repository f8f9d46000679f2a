// Gwet's AC1: a chance-corrected agreement coefficient that stays stable when one score
// dominates (high prevalence), where kappa-type coefficients can drop paradoxically low.
// Common with QA scores, where most clips are "adequate".

import { kappaInterval, multiRaterCoefficient, nullKappa, type MultiRaterOptions } from "./kappa";
import { codeMatrix, groupUnits } from "./matrix";
import type { KappaResult, RatingsMatrix } from "./types";

/**
 * Gwet's AC1 for any number of raters with missing ratings (Gwet 2008; Gwet 2014):
 * pe = Σ_k π_k(1 − π_k)/(q − 1) over q categories (the given `categories`, else those
 * observed), pe_i = Σ_k (r_ik/r_i)(1 − π_k)/(q − 1); SE by Gwet's linearisation.
 * With a single category and no `categories` list, q − 1 = 0 and the value is null.
 */
export function gwetAC1(matrix: RatingsMatrix, options: MultiRaterOptions = {}): KappaResult {
  const p = codeMatrix(matrix, "gwetAC1", options.categories, options.multiplicity);
  if (p.units === 0 || p.keys.length === 0) return nullKappa(0, "no ratings");
  const q = p.keys.length;
  if (q < 2) return nullKappa(p.units, "only one category is known; pass the full categories list to compute AC1 against the other possible scores");
  const res = multiRaterCoefficient(groupUnits(p), q, (pi) => ({
    pe: pi.reduce((s, x) => s + x * (1 - x), 0) / (q - 1),
    peUnit: (c, r) => c.reduce((s, x, k) => s + (x / r) * (1 - pi[k]), 0) / (q - 1),
  }));
  if (res.value === null) return nullKappa(res.units, res.reason);
  return { value: res.value, se: res.se, ci95: kappaInterval(res.value, res.se), units: res.units };
}
