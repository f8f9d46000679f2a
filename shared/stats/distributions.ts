// Distribution functions needed for confidence intervals: the normal quantile (Wald-type
// and Wilson intervals) and the F quantile (ICC intervals). No numeric library may be
// added to the project, so the regularized incomplete beta and gamma functions are
// implemented here after the classic continued-fraction / series recipes (Press et al.,
// Numerical Recipes, ch. 6) with a bracketed Newton inversion.

const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059, 12.507343278686905, -0.13857109526572012,
  9.9843695780195716e-6, 1.5056327351493116e-7,
];

/** Natural log of the gamma function for x > 0 (Lanczos approximation, g = 7). */
export function logGamma(x: number): number {
  if (!(x > 0)) throw new RangeError(`logGamma: x must be positive (got ${x})`);
  if (x < 0.5) return Math.log(Math.PI / Math.sin(Math.PI * x)) - logGamma(1 - x);
  const z = x - 1;
  let s = LANCZOS[0];
  for (let i = 1; i < 9; i++) s += LANCZOS[i] / (z + i);
  const t = z + 7.5;
  return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(t) - t + Math.log(s);
}

function logBeta(a: number, b: number): number {
  return logGamma(a) + logGamma(b) - logGamma(a + b);
}

const TINY = 1e-300;

// Modified Lentz evaluation of the incomplete-beta continued fraction; converges quickly
// for x < (a + 1) / (a + b + 2), which the caller guarantees by symmetry.
function betaContinuedFraction(a: number, b: number, x: number): number {
  const qab = a + b;
  const qap = a + 1;
  const qam = a - 1;
  let c = 1;
  let d = 1 - (qab * x) / qap;
  if (Math.abs(d) < TINY) d = TINY;
  d = 1 / d;
  let h = d;
  for (let m = 1; m <= 100000; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (qab + m) * x) / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < 1e-16) return h;
  }
  return h;
}

/** Regularized incomplete beta function I_x(a, b) for a, b > 0 and 0 ≤ x ≤ 1. */
export function incompleteBeta(x: number, a: number, b: number): number {
  if (!(a > 0) || !(b > 0)) throw new RangeError(`incompleteBeta: a and b must be positive (got ${a}, ${b})`);
  if (!(x >= 0 && x <= 1)) throw new RangeError(`incompleteBeta: x must lie in [0, 1] (got ${x})`);
  if (x === 0) return 0;
  if (x === 1) return 1;
  const front = Math.exp(a * Math.log(x) + b * Math.log1p(-x) - logBeta(a, b));
  if (x < (a + 1) / (a + b + 2)) return (front * betaContinuedFraction(a, b, x)) / a;
  return 1 - (front * betaContinuedFraction(b, a, 1 - x)) / b;
}

/** Inverse of the regularized incomplete beta: the x with I_x(a, b) = p. */
export function inverseIncompleteBeta(p: number, a: number, b: number): number {
  if (!(a > 0) || !(b > 0)) throw new RangeError(`inverseIncompleteBeta: a and b must be positive (got ${a}, ${b})`);
  if (!(p >= 0 && p <= 1)) throw new RangeError(`inverseIncompleteBeta: p must lie in [0, 1] (got ${p})`);
  if (p === 0) return 0;
  if (p === 1) return 1;
  // Starting point after Numerical Recipes (invbetai); the bracket below makes the
  // iteration safe even when the start is poor.
  let x: number;
  if (a >= 1 && b >= 1) {
    const pp = p < 0.5 ? p : 1 - p;
    const t = Math.sqrt(-2 * Math.log(pp));
    let z = (2.30753 + t * 0.27061) / (1 + t * (0.99229 + t * 0.04481)) - t;
    if (p < 0.5) z = -z;
    const al = (z * z - 3) / 6;
    const h = 2 / (1 / (2 * a - 1) + 1 / (2 * b - 1));
    const w = (z * Math.sqrt(al + h)) / h - (1 / (2 * b - 1) - 1 / (2 * a - 1)) * (al + 5 / 6 - 2 / (3 * h));
    x = a / (a + b * Math.exp(2 * w));
  } else {
    const lna = Math.log(a / (a + b));
    const lnb = Math.log(b / (a + b));
    const t = Math.exp(a * lna) / a;
    const u = Math.exp(b * lnb) / b;
    const w = t + u;
    x = p < t / w ? Math.pow(a * w * p, 1 / a) : 1 - Math.pow(b * w * (1 - p), 1 / b);
  }
  if (!(x > 0 && x < 1)) x = 0.5;
  const lb = logBeta(a, b);
  let lo = 0;
  let hi = 1;
  for (let i = 0; i < 1000; i++) {
    const f = incompleteBeta(x, a, b) - p;
    if (f === 0) return x;
    if (f < 0) lo = x;
    else hi = x;
    const density = Math.exp((a - 1) * Math.log(x) + (b - 1) * Math.log1p(-x) - lb);
    let next = x - f / density;
    if (!(next > lo && next < hi)) next = (lo + hi) / 2;
    if (Math.abs(next - x) <= 1e-15 * Math.max(next, 1e-300) || hi - lo <= 1e-16 * Math.max(lo, 1e-300)) return next;
    x = next;
  }
  return x;
}

// Series for P(a, x) when x < a + 1, continued fraction for Q(a, x) otherwise.
function gammaSeries(a: number, x: number): number {
  let sum = 1 / a;
  let del = sum;
  let ap = a;
  for (let n = 0; n < 100000; n++) {
    ap += 1;
    del *= x / ap;
    sum += del;
    if (Math.abs(del) < Math.abs(sum) * 1e-17) break;
  }
  return sum * Math.exp(-x + a * Math.log(x) - logGamma(a));
}

function gammaContinuedFraction(a: number, x: number): number {
  let b = x + 1 - a;
  let c = 1 / TINY;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < 100000; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < TINY) d = TINY;
    c = b + an / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < 1e-16) break;
  }
  return Math.exp(-x + a * Math.log(x) - logGamma(a)) * h;
}

/** Regularized upper incomplete gamma function Q(a, x) for a > 0, x ≥ 0. */
export function upperIncompleteGamma(a: number, x: number): number {
  if (!(a > 0) || !(x >= 0)) throw new RangeError(`upperIncompleteGamma: need a > 0 and x >= 0 (got ${a}, ${x})`);
  if (x === 0) return 1;
  return x < a + 1 ? 1 - gammaSeries(a, x) : gammaContinuedFraction(a, x);
}

/** Standard normal cumulative distribution function. */
export function normalCdf(z: number): number {
  // Φ(z) = erfc(-z/√2)/2 and erfc(y) = Q(1/2, y²) for y ≥ 0; working in the tail that is
  // small keeps full relative precision.
  const q = 0.5 * upperIncompleteGamma(0.5, (z * z) / 2);
  return z < 0 ? q : 1 - q;
}

/** Standard normal quantile Φ⁻¹(p) for 0 < p < 1. */
export function normalQuantile(p: number): number {
  if (!(p > 0 && p < 1)) throw new RangeError(`normalQuantile: p must lie in (0, 1) (got ${p})`);
  // Rational starting approximation after Acklam (relative error ~1e-9), then Halley
  // steps against the exact cdf above to reach double precision.
  const a = [-39.69683028665376, 220.9460984245205, -275.9285104469687, 138.357751867269, -30.66479806614716, 2.506628277459239];
  const b = [-54.47609879822406, 161.5858368580409, -155.6989798598866, 66.80131188771972, -13.28068155288572];
  const c = [-0.007784894002430293, -0.3223964580411365, -2.400758277161838, -2.549732539343734, 4.374664141464968, 2.938163982698783];
  const d = [0.007784695709041462, 0.3224671290700398, 2.445134137142996, 3.754408661907416];
  const plow = 0.02425;
  let x: number;
  if (p < plow) {
    const q = Math.sqrt(-2 * Math.log(p));
    x = (((((c[0] * q + c[1]) * q + c[2]) * q + c[3]) * q + c[4]) * q + c[5]) / ((((d[0] * q + d[1]) * q + d[2]) * q + d[3]) * q + 1);
  } else if (p <= 1 - plow) {
    const q = p - 0.5;
    const r = q * q;
    x = ((((((a[0] * r + a[1]) * r + a[2]) * r + a[3]) * r + a[4]) * r + a[5]) * q) / (((((b[0] * r + b[1]) * r + b[2]) * r + b[3]) * r + b[4]) * r + 1);
  } else {
    const q = Math.sqrt(-2 * Math.log(1 - p));
    x = -(((((c[0] * q + c[1]) * q + c[2]) * q + c[3]) * q + c[4]) * q + c[5]) / ((((d[0] * q + d[1]) * q + d[2]) * q + d[3]) * q + 1);
  }
  for (let i = 0; i < 3; i++) {
    // Compare in the smaller tail to avoid cancellation in 1 - p.
    const e = x < 0 ? normalCdf(x) - p : 1 - p - normalCdf(-x);
    const u = e * Math.sqrt(2 * Math.PI) * Math.exp((x * x) / 2);
    const step = u / (1 + (x * u) / 2);
    x -= step;
    if (Math.abs(step) < 1e-16 * Math.max(1, Math.abs(x))) break;
  }
  return x;
}

/** Quantile of the F distribution with (df1, df2) degrees of freedom (df may be non-integer). */
export function fQuantile(p: number, df1: number, df2: number): number {
  if (!(p > 0 && p < 1)) throw new RangeError(`fQuantile: p must lie in (0, 1) (got ${p})`);
  if (!(df1 > 0) || !(df2 > 0) || !Number.isFinite(df1) || !Number.isFinite(df2))
    throw new RangeError(`fQuantile: degrees of freedom must be positive and finite (got ${df1}, ${df2})`);
  // F = (df2/df1)·(1-y)/y with y ~ Beta(df2/2, df1/2); inverting for y keeps precision in
  // the upper tail, which is where confidence limits live.
  const y = inverseIncompleteBeta(1 - p, df2 / 2, df1 / 2);
  return ((df2 / df1) * (1 - y)) / y;
}
