// Learning-curve CUSUM for a binary outcome (failure / success per attempt), the chart
// used in procedural medicine to show when a learner's failure rate is acceptable.
// It is Wald's (1945) sequential probability ratio test between H0: failure rate p0
// (acceptable) and H1: failure rate p1 (unacceptable), rescaled so that the steps are s
// and 1 − s, as set out for learning curves by Williams et al. (1992) and Bolsin &
// Colson (2000):
//
//   P  = ln(p1 / p0)              Q  = ln((1 − p0) / (1 − p1))
//   s  = Q / (P + Q)              (the step down for a success)
//   a  = ln((1 − β) / α)          b  = ln((1 − α) / β)
//   h1 =  a / (P + Q)             h0 = −b / (P + Q)
//
// Sign convention: the path starts at 0 (not included in `path`); each success moves it
// down by s, each failure up by 1 − s; path[i] is the value after outcome i. Because
// (P + Q)·path[i] is exactly the log-likelihood ratio ln L(p1)/L(p0) of the first i + 1
// outcomes, the limits are Wald's: crossing (reaching or passing) h0 from above accepts H0
// → signal "competent"; reaching or passing h1 accepts H1 → signal "unacceptable".
// `signal` and `signalAt` describe the FIRST crossing only (where the sequential test
// stops); signalAt is the 0-based index into `outcomes` of the attempt whose result
// caused it, null while the path is still between the limits ("none"). The path keeps
// going after a signal so that a chart can show the later course.

export interface CusumOptions {
  /** Acceptable failure rate (H0). */
  p0: number;
  /** Unacceptable failure rate (H1), greater than p0. */
  p1: number;
  /** Type I error: probability of signalling "unacceptable" when the true rate is p0. */
  alpha: number;
  /** Type II error: probability of signalling "competent" when the true rate is p1. */
  beta: number;
}

export type CusumSignal = "competent" | "unacceptable" | "none";

export interface CusumResult {
  s: number;
  h0: number;
  h1: number;
  path: number[];
  signal: CusumSignal;
  signalAt: number | null;
}

/** Learning-curve CUSUM (SPRT form) for outcomes where true means failure. */
export function cusum(outcomes: readonly boolean[], options: CusumOptions): CusumResult {
  if (!Array.isArray(outcomes)) throw new TypeError("cusum: outcomes must be an array of booleans");
  const { p0, p1, alpha, beta } = options;
  for (const [name, v] of [
    ["p0", p0],
    ["p1", p1],
    ["alpha", alpha],
    ["beta", beta],
  ] as const)
    if (typeof v !== "number" || !(v > 0 && v < 1)) throw new RangeError(`cusum: ${name} must lie strictly between 0 and 1 (got ${String(v)})`);
  if (!(p1 > p0)) throw new RangeError(`cusum: p1 (${p1}) must exceed p0 (${p0})`);
  if (!(alpha + beta < 1)) throw new RangeError("cusum: alpha + beta must be below 1");
  const P = Math.log(p1 / p0);
  const Q = Math.log((1 - p0) / (1 - p1));
  const s = Q / (P + Q);
  const h1 = Math.log((1 - beta) / alpha) / (P + Q);
  const h0 = -Math.log((1 - alpha) / beta) / (P + Q);
  const path: number[] = [];
  let signal: CusumSignal = "none";
  let signalAt: number | null = null;
  let value = 0;
  outcomes.forEach((failed, i) => {
    if (typeof failed !== "boolean") throw new TypeError(`cusum: outcome ${i} is not a boolean`);
    value += failed ? 1 - s : -s;
    path.push(value);
    if (signalAt === null) {
      // A relative tolerance keeps a path that lands on a limit up to rounding (after
      // many equal steps) from missing the signal.
      const eps = 1e-12 * Math.max(1, Math.abs(value));
      if (value <= h0 + eps) {
        signal = "competent";
        signalAt = i;
      } else if (value >= h1 - eps) {
        signal = "unacceptable";
        signalAt = i;
      }
    }
  });
  return { s, h0, h1, path, signal, signalAt };
}
