// Wilson (1927) score interval for a binomial proportion, used for accuracy figures
// (sensitivity, specificity, PPV, NPV) where counts are small and proportions sit near
// 0 or 1: unlike the Wald interval it never leaves [0, 1] and does not collapse at 0/n.

import { normalQuantile } from "./distributions";

/** Wilson score interval (without continuity correction) for successes out of n; [0, 1] when n = 0. */
export function wilsonInterval(successes: number, n: number, confidence = 0.95): [number, number] {
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`wilsonInterval: n must be a non-negative integer (got ${n})`);
  if (!Number.isInteger(successes) || successes < 0 || successes > n)
    throw new RangeError(`wilsonInterval: successes must be an integer between 0 and n (got ${successes} of ${n})`);
  if (!(confidence > 0 && confidence < 1)) throw new RangeError(`wilsonInterval: confidence must lie strictly between 0 and 1 (got ${confidence})`);
  // No trials means no information: the honest interval is the whole range.
  if (n === 0) return [0, 1];
  const z = normalQuantile(1 - (1 - confidence) / 2);
  const p = successes / n;
  const z2 = z * z;
  const denom = 1 + z2 / n;
  const centre = (p + z2 / (2 * n)) / denom;
  const half = (z / denom) * Math.sqrt((p * (1 - p)) / n + z2 / (4 * n * n));
  // At 0/n and n/n the bound is exactly 0 or 1 algebraically; pin it so rounding cannot
  // produce -1e-17 in a report.
  const lo = successes === 0 ? 0 : Math.max(0, centre - half);
  const hi = successes === n ? 1 : Math.min(1, centre + half);
  return [lo, hi];
}
