// Grouped input: every agreement statistic takes an optional `multiplicity` per row (how
// many identical units the row stands for), so a report can pass counted rating patterns
// instead of one row per exam. The reference is the same statistic on the matrix with
// each row repeated that many times — itself checked against published examples and
// statsmodels/sklearn in the other test files. The bootstrap's resampling by group counts
// is checked against plain unit-by-unit resampling, and the binomial draws behind it
// against the binomial distribution.
import { describe, expect, it } from "vitest";
import { binomialDraw } from "./random";
import { upperIncompleteGamma } from "./distributions";
import { cohensKappa, fleissKappa, gwetAC1, krippendorffAlpha, mulberry32, percentAgreement, type Rating } from "./index";
import type { AlphaLevel, KappaWeights } from "./index";

const TOL = 1e-12;
const rand = mulberry32(20261202);
const int = (lo: number, hi: number): number => lo + Math.floor(rand() * (hi - lo + 1));

/** Random ratings with missing values: raters copy a unit's "true" category with probability 0.6. */
function ratings(rows: number, raters: number, q: number, missing: number, offset = 0): Rating[][] {
  return Array.from({ length: rows }, () => {
    const truth = int(0, q - 1);
    return Array.from({ length: raters }, () => (rand() < missing ? null : (rand() < 0.6 ? truth : int(0, q - 1)) + offset));
  });
}

/** Repeats row i multiplicity[i] times and shuffles the result (order must not matter). */
function expand(rows: Rating[][], multiplicity: number[]): Rating[][] {
  const out = rows.flatMap((row, i) => Array.from({ length: multiplicity[i] }, () => row));
  for (let i = out.length - 1; i > 0; i--) {
    const j = Math.floor(rand() * (i + 1));
    [out[i], out[j]] = [out[j], out[i]];
  }
  return out;
}

/** Distinct rows with random multiplicities 0..6 (a few zeros among them). */
function grouped(raters: number, q: number, missing: number, offset = 0): { rows: Rating[][]; multiplicity: number[] } {
  const rows = ratings(int(3, 25), raters, q, missing, offset);
  return { rows, multiplicity: rows.map(() => (rand() < 0.1 ? 0 : int(1, 6))) };
}

function same(a: number | null | undefined, b: number | null | undefined, label: string): void {
  if (b === null || b === undefined) return expect(a ?? null, label).toBeNull();
  expect(typeof a, label).toBe("number");
  expect(Math.abs((a as number) - b), `${label}: ${a} vs ${b}`).toBeLessThanOrEqual(TOL);
}

function sameInterval(a: [number, number] | null | undefined, b: [number, number] | null | undefined, label: string): void {
  if (!b) return expect(a ?? null, label).toBeNull();
  same(a?.[0], b[0], `${label} lower`);
  same(a?.[1], b[1], `${label} upper`);
}

describe("multiplicity: grouped rows equal the expanded matrix (random matrices with missing ratings)", () => {
  it("percent agreement, Fleiss' kappa and Gwet's AC1", () => {
    let defined = 0;
    for (let i = 0; i < 60; i++) {
      const q = int(2, 5);
      const { rows, multiplicity } = grouped(int(2, 5), q, i % 2 ? 0.25 : 0);
      const full = expand(rows, multiplicity);
      const pa = [percentAgreement(rows, { multiplicity }), percentAgreement(full)];
      same(pa[0].value, pa[1].value, `percent #${i}`);
      expect(pa[0].units).toBe(pa[1].units);
      for (const [name, f] of [
        ["fleiss", fleissKappa],
        ["ac1", gwetAC1],
      ] as const) {
        // Without categories (observed ones only) and with the full list.
        for (const categories of [undefined, Array.from({ length: q }, (_, k) => k)]) {
          const g = f(rows, { multiplicity, categories });
          const e = f(full, { categories });
          same(g.value, e.value, `${name} #${i} value`);
          same(g.se, e.se, `${name} #${i} se`);
          sameInterval(g.ci95, e.ci95, `${name} #${i} ci95`);
          expect(g.units, `${name} #${i} units`).toBe(e.units);
          if (e.value !== null) defined++;
        }
      }
    }
    expect(defined).toBeGreaterThan(200);
  });

  it("Cohen's kappa, unweighted and weighted", () => {
    let defined = 0;
    for (let i = 0; i < 60; i++) {
      const q = int(2, 5);
      const { rows, multiplicity } = grouped(2, q, 0.15);
      const full = expand(rows, multiplicity);
      for (const weights of ["unweighted", "linear", "quadratic"] as KappaWeights[]) {
        const g = cohensKappa(rows, { weights, multiplicity, categories: Array.from({ length: q }, (_, k) => k) });
        const e = cohensKappa(full, { weights, categories: Array.from({ length: q }, (_, k) => k) });
        same(g.value, e.value, `cohen ${weights} #${i} value`);
        same(g.se, e.se, `cohen ${weights} #${i} se`);
        sameInterval(g.ci95, e.ci95, `cohen ${weights} #${i} ci95`);
        expect(g.units).toBe(e.units);
        if (e.value !== null) defined++;
      }
    }
    expect(defined).toBeGreaterThan(150);
  });

  it("Krippendorff's alpha at every level, bootstrap interval included", () => {
    let withInterval = 0;
    for (let i = 0; i < 40; i++) {
      const { rows, multiplicity } = grouped(int(2, 5), int(2, 5), 0.3, 1);
      const full = expand(rows, multiplicity);
      for (const level of ["nominal", "ordinal", "interval", "ratio"] as AlphaLevel[]) {
        const bootstrap = { samples: 200, seed: i + 1 };
        const g = krippendorffAlpha(rows, { level, multiplicity, bootstrap });
        const e = krippendorffAlpha(full, { level, bootstrap });
        same(g.value, e.value, `alpha ${level} #${i}`);
        sameInterval(g.ci95, e.ci95, `alpha ${level} #${i} ci95`);
        expect(g.units).toBe(e.units);
        expect(g.pairableValues).toBe(e.pairableValues);
        expect(g.bootstrap).toEqual(e.bootstrap);
        if (e.ci95) withInterval++;
      }
    }
    expect(withInterval).toBeGreaterThan(120);
  });

  it("rows of multiplicity 0 are as if absent, also for the categories they name", () => {
    // AC1 without a categories list counts the observed categories (q); a zero-weight row
    // naming a third category must not raise q from 2 to 3.
    const rows = [
      ["a", "a"],
      ["a", "b"],
      ["b", "b"],
      ["c", "c"],
    ];
    const g = gwetAC1(rows, { multiplicity: [5, 2, 4, 0] });
    const e = gwetAC1(expand(rows.slice(0, 3), [5, 2, 4]));
    expect(g).toEqual(e);
    expect(percentAgreement(rows, { multiplicity: [0, 0, 0, 0] }).value).toBeNull();
    expect(cohensKappa(rows, { multiplicity: [0, 0, 0, 0] }).value).toBeNull();
  });

  it("rejects a multiplicity list of the wrong length or with other than whole numbers ≥ 0", () => {
    const rows = [
      [1, 2],
      [2, 2],
    ];
    expect(() => fleissKappa(rows, { multiplicity: [1] })).toThrow(/multiplicity has 1 entries but the matrix has 2 rows/);
    expect(() => cohensKappa(rows, { multiplicity: [1, -1] })).toThrow(/multiplicity of row 1/);
    expect(() => krippendorffAlpha(rows, { level: "nominal", multiplicity: [1, 0.5] })).toThrow(/whole number/);
    expect(() => percentAgreement(rows, { multiplicity: [1, Number.NaN] })).toThrow(/whole number/);
  });
});

describe("alpha bootstrap on grouped units", () => {
  it("does not depend on the order of the rows", () => {
    const m = ratings(60, 3, 4, 0.2);
    const shuffled = expand(
      m,
      m.map(() => 1),
    );
    const a = krippendorffAlpha(m, { level: "ordinal", bootstrap: { samples: 500, seed: 9 } });
    const b = krippendorffAlpha(shuffled, { level: "ordinal", bootstrap: { samples: 500, seed: 9 } });
    expect(b.ci95).toEqual(a.ci95);
  });

  it("matches plain resampling of units one by one (Efron & Tibshirani 1993, ch. 6)", () => {
    // The reference draws N units uniformly with replacement and recomputes alpha; the
    // module draws how many units come from each group (multinomial). Both estimate the
    // same percentiles; with 4000 resamples each, the endpoints differed by at most 2.6 %
    // of the interval width over eight trial data sets, so 6 % is a safe margin — while
    // resampling half or twice the units moved them by 15–23 %.
    const m = ratings(40, 3, 4, 0.15);
    const R = 4000;
    const module = krippendorffAlpha(m, { level: "nominal", bootstrap: { samples: R, seed: 3 } });
    const pairable = m.filter((row) => row.filter((v) => v !== null).length >= 2);
    const plain = (size: number) => {
      const r = mulberry32(77);
      const draws: number[] = [];
      for (let s = 0; s < R; s++) {
        const sample = Array.from({ length: size }, () => pairable[Math.floor(r() * pairable.length)]);
        const a = krippendorffAlpha(sample, { level: "nominal" }).value;
        if (a !== null) draws.push(a);
      }
      draws.sort((x, y) => x - y);
      const at = (p: number) => {
        const h = (draws.length - 1) * p;
        const lo = Math.floor(h);
        return draws[lo] + (h - lo) * (draws[Math.min(lo + 1, draws.length - 1)] - draws[lo]);
      };
      return [at(0.025), at(0.975)];
    };
    const [lo, hi] = module.ci95!;
    const width = hi - lo;
    const right = plain(pairable.length);
    expect(Math.abs(right[0] - lo) / width).toBeLessThan(0.06);
    expect(Math.abs(right[1] - hi) / width).toBeLessThan(0.06);
    // Sanity: the comparison can tell a wrong resample size apart.
    for (const wrong of [plain(Math.round(pairable.length * 0.5)), plain(pairable.length * 2)])
      expect(Math.max(Math.abs(wrong[0] - lo), Math.abs(wrong[1] - hi)) / width).toBeGreaterThan(0.1);
  });
});

describe("binomialDraw", () => {
  /** Binomial probabilities by the textbook formula C(n, k) p^k (1 − p)^(n − k), built up term by term. */
  function pmf(n: number, p: number): number[] {
    const out = [Math.pow(1 - p, n)];
    for (let k = 1; k <= n; k++) out.push((out[k - 1] * (n - k + 1) * p) / (k * (1 - p)));
    return out;
  }

  // Both ways of searching: from 0 (mean below 16) and from the mode.
  it.each([
    [20, 0.3],
    [7, 0.9],
    [60, 0.05],
    [400, 0.4],
    [1000, 0.03],
    [50, 0.97],
  ])("follows Binomial(%i, %f) (Pearson chi-square, p > 0.001)", (n, p) => {
    const r = mulberry32(n * 1000 + Math.round(p * 100));
    const draws = 20000;
    const seen = new Array<number>(n + 1).fill(0);
    for (let i = 0; i < draws; i++) seen[binomialDraw(n, p, r)] += 1;
    // Pool the tails so every bin expects at least 5 draws.
    const expectedCounts = pmf(n, p).map((x) => x * draws);
    const bins: { e: number; o: number }[] = [];
    let acc = { e: 0, o: 0 };
    expectedCounts.forEach((e, k) => {
      acc = { e: acc.e + e, o: acc.o + seen[k] };
      if (acc.e >= 5) {
        bins.push(acc);
        acc = { e: 0, o: 0 };
      }
    });
    if (acc.e > 0) bins[bins.length - 1] = { e: bins[bins.length - 1].e + acc.e, o: bins[bins.length - 1].o + acc.o };
    const chi2 = bins.reduce((s, b) => s + (b.o - b.e) ** 2 / b.e, 0);
    const pValue = upperIncompleteGamma((bins.length - 1) / 2, chi2 / 2);
    expect(pValue).toBeGreaterThan(0.001);
  });

  it("has mean np and variance np(1 − p) for large n, and handles the edges", () => {
    const r = mulberry32(5);
    const n = 300_000;
    const p = 0.013;
    const xs = Array.from({ length: 4000 }, () => binomialDraw(n, p, r));
    const mean = xs.reduce((s, x) => s + x, 0) / xs.length;
    const variance = xs.reduce((s, x) => s + (x - mean) ** 2, 0) / (xs.length - 1);
    const sd = Math.sqrt(n * p * (1 - p));
    // Standard error of the mean is sd/√4000 ≈ 1; of the variance about √(2/4000) ≈ 2.2 %.
    expect(Math.abs(mean - n * p)).toBeLessThan(4 * (sd / Math.sqrt(xs.length)));
    expect(Math.abs(variance / (sd * sd) - 1)).toBeLessThan(0.1);
    expect(binomialDraw(0, 0.5, r)).toBe(0);
    expect(binomialDraw(10, 0, r)).toBe(0);
    expect(binomialDraw(10, 1, r)).toBe(10);
    expect(() => binomialDraw(-1, 0.5, r)).toThrow(RangeError);
    expect(() => binomialDraw(3, 1.5, r)).toThrow(RangeError);
  });
});
