// Soundings statistics: agreement between reviewers and learner-progress figures, as
// pure functions usable on the server and in the browser (no Node APIs, no I/O).
//
// Input for the agreement functions: a ratings matrix with one row per unit (exam or
// clip) and one column per rater; a cell is a number, a category label, or null when
// that rater gave no rating. Numeric strings count as the number they spell. Categories
// are ordered as given in `categories`, else numerically when every label is numeric,
// else in natural order ("grade 2" before "grade 10").
//
// Grouped input: percentAgreement, cohensKappa, fleissKappa, gwetAC1 and krippendorffAlpha
// take an optional `multiplicity` (one whole number ≥ 0 per row: how many identical units
// the row stands for), e.g. counted rating pairs from a GROUP BY. The result equals that
// of the matrix with every row repeated so often — alpha's bootstrap interval included,
// since units are grouped by their category counts internally either way (matrix.ts) and
// resampled by group (alpha.ts). Rows of multiplicity 0 count as absent.
//
// Structurally bad input throws an Error: ragged rows, cells that are not finite
// numbers / non-empty strings / null, ratings outside a given `categories` list,
// cohensKappa with a number of columns other than 2, unknown options, a multiplicity list
// of the wrong length or with entries other than whole numbers ≥ 0.
//
// Degenerate input never yields NaN or Infinity. The rule is uniform: the result has
// `value: null` (and `se`/`ci95` null where present) plus a `reason` string when
//   - the matrix is empty or holds no ratings;
//   - percentAgreement: no unit has two or more ratings;
//   - chance-corrected coefficients (Cohen's and Fleiss' kappa, AC1, alpha): fewer than
//     two units with two or more ratings (for Cohen: rated by both raters), because a
//     single unit cannot separate agreement from chance;
//   - every rater used one and the same category, so chance agreement is 1 (kappa) or
//     there is no variation (alpha): the coefficient is 0/0. Percent agreement is 1 in
//     that case and is the figure to show. AC1 is defined there (value 1) when the full
//     `categories` list has two or more entries; with only the observed single category
//     it is null;
//   - ICC: fewer than two complete units or two raters, or no variance at all.
// When the coefficient is defined but its error term is zero (perfect agreement with
// chance agreement below 1), the value is 1 and the interval [1, 1].

export type { AlphaResult, Category, IccResult, Interval, KappaResult, PercentAgreementResult, Rating, RatingsMatrix } from "./types";
export { percentAgreement } from "./agreement";
export { cohensKappa, fleissKappa } from "./kappa";
export type { CohensKappaOptions, KappaWeights, MultiRaterOptions } from "./kappa";
export { gwetAC1 } from "./gwet";
export { krippendorffAlpha } from "./alpha";
export type { AlphaLevel, AlphaOptions } from "./alpha";
export { icc } from "./icc";
export type { IccModel, IccUnit } from "./icc";
export { wilsonInterval } from "./wilson";
export { cusum } from "./cusum";
export type { CusumOptions, CusumResult, CusumSignal } from "./cusum";
export { agreementBand } from "./bands";
export type { AgreementBand } from "./bands";
export { binomialDraw, mulberry32 } from "./random";
export { fQuantile, incompleteBeta, inverseIncompleteBeta, normalCdf, normalQuantile } from "./distributions";
