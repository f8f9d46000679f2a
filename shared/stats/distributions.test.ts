import { describe, expect, it } from "vitest";
import { fQuantile, incompleteBeta, inverseIncompleteBeta, mulberry32, normalCdf, normalQuantile } from "./index";

describe("normal distribution", () => {
  it("matches standard normal table quantiles", () => {
    // Standard normal tables (e.g. Abramowitz & Stegun 1964, Table 26.5; from memory).
    expect(normalQuantile(0.975)).toBeCloseTo(1.959963985, 9);
    expect(normalQuantile(0.95)).toBeCloseTo(1.644853627, 9);
    expect(normalQuantile(0.995)).toBeCloseTo(2.575829304, 9);
    expect(normalQuantile(0.5)).toBe(0);
    expect(normalQuantile(0.025)).toBeCloseTo(-1.959963985, 9);
    expect(normalCdf(1.96)).toBeCloseTo(0.9750021, 7);
  });

  it("inverts its own cdf far into the tails", () => {
    for (const p of [1e-12, 1e-6, 0.01, 0.3, 0.7, 0.99, 1 - 1e-9]) {
      const z = normalQuantile(p);
      const back = z < 0 ? normalCdf(z) : 1 - normalCdf(-z);
      expect(Math.abs(back - p) / Math.min(p, 1 - p)).toBeLessThan(1e-9);
    }
  });
});

describe("regularized incomplete beta", () => {
  it("satisfies closed forms", () => {
    // Abramowitz & Stegun (1964) 26.5: I_x(a, 1) = x^a, I_x(1, b) = 1 − (1 − x)^b,
    // I_x(a, b) = 1 − I_{1−x}(b, a), I_{1/2}(a, a) = 1/2.
    for (const x of [0.01, 0.3, 0.77, 0.999]) {
      expect(incompleteBeta(x, 3.5, 1)).toBeCloseTo(x ** 3.5, 13);
      expect(incompleteBeta(x, 1, 4.2)).toBeCloseTo(1 - (1 - x) ** 4.2, 13);
      expect(incompleteBeta(x, 2.5, 7)).toBeCloseTo(1 - incompleteBeta(1 - x, 7, 2.5), 13);
    }
    expect(incompleteBeta(0.5, 13.7, 13.7)).toBeCloseTo(0.5, 13);
    // Binomial-sum identity: I_x(2, 3) = P(Binomial(4, x) ≥ 2) = 6x² − 8x³ + 3x⁴.
    expect(incompleteBeta(0.3, 2, 3)).toBeCloseTo(6 * 0.09 - 8 * 0.027 + 3 * 0.0081, 14);
  });

  it("is inverted by inverseIncompleteBeta", () => {
    for (const [a, b] of [
      [0.5, 0.5],
      [0.3, 8],
      [2, 3],
      [40, 2.5],
      [250, 400],
    ])
      for (const p of [0.001, 0.025, 0.5, 0.975, 0.999]) {
        const x = inverseIncompleteBeta(p, a, b);
        expect(incompleteBeta(x, a, b)).toBeCloseTo(p, 12);
      }
  });
});

describe("F quantiles", () => {
  it("match printed F tables", () => {
    // Upper percentage points of the F distribution (standard statistical tables, e.g.
    // Pearson & Hartley 1966; from memory, 2–3 decimals as printed).
    expect(fQuantile(0.95, 1, 10)).toBeCloseTo(4.96, 2);
    expect(fQuantile(0.95, 5, 10)).toBeCloseTo(3.33, 2);
    expect(fQuantile(0.99, 2, 20)).toBeCloseTo(5.85, 2);
    expect(fQuantile(0.975, 5, 15)).toBeCloseTo(3.58, 2);
  });

  it("satisfy F_p(d1, d2) = 1 / F_{1−p}(d2, d1) and F(1, d) = t²", () => {
    expect(fQuantile(0.975, 4, 9)).toBeCloseTo(1 / fQuantile(0.025, 9, 4), 12);
    // t_{0.975}(10) = 2.228139 (t tables, from memory): F_{0.95}(1, 10) = t².
    expect(fQuantile(0.95, 1, 10)).toBeCloseTo(2.228139 ** 2, 5);
  });
});

describe("mulberry32", () => {
  it("is deterministic per seed and roughly uniform", () => {
    const a = mulberry32(99);
    const b = mulberry32(99);
    const xs = Array.from({ length: 20000 }, () => a());
    expect(xs.slice(0, 5)).toEqual(Array.from({ length: 5 }, () => b()));
    expect(mulberry32(100)()).not.toBe(xs[0]);
    // Chi-square over 10 equal bins, 9 df: the 99.9% point is 27.88 (chi-square tables).
    const bins = new Array<number>(10).fill(0);
    for (const x of xs) {
      expect(x).toBeGreaterThanOrEqual(0);
      expect(x).toBeLessThan(1);
      bins[Math.floor(x * 10)] += 1;
    }
    const chi2 = bins.reduce((s, o) => s + (o - 2000) ** 2 / 2000, 0);
    expect(chi2).toBeLessThan(27.88);
  });
});
