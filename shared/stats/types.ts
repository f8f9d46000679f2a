// Shared shapes of the statistics module. Results carry `value: null` plus a `reason`
// instead of NaN so that a report can show "not computable: <reason>" without every
// caller re-checking for NaN/Infinity.

/** One rating: a number, a category label, or null when the rater gave none. */
export type Rating = number | string | null;

/** A category label as used in `categories` options. */
export type Category = number | string;

/** One row per unit (exam or clip), one column per rater. */
export type RatingsMatrix = ReadonlyArray<ReadonlyArray<Rating>>;

/** Closed interval [lower, upper]. */
export type Interval = [number, number];

export interface PercentAgreementResult {
  /** Mean over units of the share of agreeing rater pairs; null when not computable. */
  value: number | null;
  /** Units that entered the mean (those with at least two ratings). */
  units: number;
  reason?: string;
}

export interface KappaResult {
  value: number | null;
  /** Asymptotic standard error (non-null-hypothesis form), null when value is null. */
  se: number | null;
  /** value ± z(0.975)·se, clipped to [-1, 1]; null when value is null. */
  ci95: Interval | null;
  /** Units that entered the computation. */
  units: number;
  reason?: string;
}

export interface AlphaResult {
  value: number | null;
  /** Percentile bootstrap interval over units; only present when a bootstrap was asked for and was computable. */
  ci95?: Interval;
  /** Units with at least two ratings (the only ones that carry information for alpha). */
  units: number;
  /** Number of pairable values (n in Krippendorff's notation). */
  pairableValues: number;
  /** Bootstrap bookkeeping: resamples drawn and resamples with a defined alpha. */
  bootstrap?: { samples: number; used: number; seed: number };
  reason?: string;
}

export interface IccResult {
  value: number | null;
  ci95: Interval | null;
  /** Complete units (rows without a missing rating) used. */
  units: number;
  raters: number;
  reason?: string;
}
