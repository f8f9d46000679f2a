// Small seeded pseudo-random generator so that bootstrap intervals are reproducible:
// the same data and seed give the same interval on the server, in the browser and in
// tests. Statistical quality is ample for resampling; it is not for cryptography.

import { logGamma } from "./distributions";

/** mulberry32 generator: returns a function yielding uniform numbers in [0, 1). */
export function mulberry32(seed: number): () => number {
  if (!Number.isFinite(seed)) throw new RangeError(`mulberry32: seed must be a finite number (got ${seed})`);
  let state = Math.trunc(seed) >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * One draw from Binomial(n, p) using the uniform generator `rand`, by exact inversion.
 * Probabilities follow from one another by f(k + 1)/f(k) = (n − k)/(k + 1) · p/(1 − p).
 * With a small mean (np < 16) the search starts at 0 from f(0) = (1 − p)^n; otherwise it
 * starts at the mode (f from log-gamma) and goes outward, alternately above and below, so
 * a draw costs about one step per standard deviation however large n is.
 */
export function binomialDraw(n: number, p: number, rand: () => number): number {
  if (!Number.isSafeInteger(n) || n < 0) throw new RangeError(`binomialDraw: n must be a whole number ≥ 0 (got ${n})`);
  if (!(p >= 0 && p <= 1)) throw new RangeError(`binomialDraw: p must lie in [0, 1] (got ${p})`);
  if (n === 0 || p === 0) return 0;
  if (p === 1) return n;
  const odds = p / (1 - p);
  if (n * p < 16) {
    let f = Math.exp(n * Math.log1p(-p));
    let u = rand();
    let k = 0;
    while (u >= f && k < n && f > 0) {
      u -= f;
      f *= ((n - k) / (k + 1)) * odds;
      k += 1;
    }
    return k;
  }
  const mode = Math.min(n, Math.floor((n + 1) * p));
  const fMode = Math.exp(logGamma(n + 1) - logGamma(mode + 1) - logGamma(n - mode + 1) + mode * Math.log(p) + (n - mode) * Math.log1p(-p));
  let u = rand() - fMode;
  if (u < 0) return mode;
  let hi = mode;
  let lo = mode;
  let fHi = fMode;
  let fLo = fMode;
  while (fHi > 0 || fLo > 0) {
    if (hi < n) {
      fHi *= ((n - hi) / (hi + 1)) * odds;
      hi += 1;
      u -= fHi;
      if (u < 0) return hi;
    } else fHi = 0;
    if (lo > 0) {
      fLo *= lo / ((n - lo + 1) * odds);
      lo -= 1;
      u -= fLo;
      if (u < 0) return lo;
    } else fLo = 0;
  }
  // Only rounding leaves probability over (u within ~1e-12 of 1): the mode takes it.
  return mode;
}
