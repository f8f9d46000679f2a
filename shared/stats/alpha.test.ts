import { describe, expect, it } from "vitest";
import { krippendorffAlpha } from "./index";

// Krippendorff (2011), "Computing Krippendorff's Alpha-Reliability", section C: reliability
// data of 4 observers (A–D, columns) × 12 units (rows) with missing values; unit 12 has a
// single value and is not pairable (n = 40 pairable values). Published results:
// nominal .743, ordinal .815, interval .849, ratio .797 (data and values from memory).
const KRIPPENDORFF_2011 = [
  [1, 1, null, 1],
  [2, 2, 3, 2],
  [3, 3, 3, 3],
  [3, 3, 3, 3],
  [2, 2, 2, 2],
  [1, 2, 3, 4],
  [4, 4, 4, 4],
  [1, 1, 2, 1],
  [2, 2, 2, 2],
  [null, 5, 5, 5],
  [null, null, 1, 1],
  [null, 3, null, null],
];

describe("krippendorffAlpha — Krippendorff (2011) worked example", () => {
  it.each([
    ["nominal", 0.743],
    ["ordinal", 0.815],
    ["interval", 0.849],
    ["ratio", 0.797],
  ] as const)("%s level gives %s", (level, expected) => {
    const r = krippendorffAlpha(KRIPPENDORFF_2011, { level });
    expect(r.value).toBeCloseTo(expected, 3);
    expect(r.pairableValues).toBe(40);
    expect(r.units).toBe(11);
  });

  it("nominal alpha equals the exact fraction worked out by hand from the data", () => {
    // Krippendorff (2011) formula α = 1 − (n − 1)·Σ_{c≠k} o_ck / Σ_{c≠k} n_c·n_k, counted by
    // hand: value totals n_c = (9, 13, 10, 5, 3), n = 40, Σ n_c² = 384; off-diagonal
    // coincidences come from unit 2 (6 ordered pairs / 3), unit 6 (12 / 3) and unit 8
    // (6 / 3), total 8. So α = 1 − 39·8 / (1600 − 384) = 1 − 312/1216.
    expect(krippendorffAlpha(KRIPPENDORFF_2011, { level: "nominal" }).value).toBeCloseTo(1 - 312 / 1216, 12);
  });

  it("orders string labels by the given categories for the ordinal metric", () => {
    // Relabelling 1..5 as words with an explicit order must not change ordinal alpha;
    // without the order, alphabetical order would scramble the scale and change it.
    const words = ["none", "poor", "fair", "good", "ideal"];
    const relabelled = KRIPPENDORFF_2011.map((row) => row.map((v) => (v === null ? null : words[v - 1])));
    const ordered = krippendorffAlpha(relabelled, { level: "ordinal", categories: words });
    expect(ordered.value).toBeCloseTo(0.815, 3);
    const alphabetical = krippendorffAlpha(relabelled, { level: "ordinal" });
    expect(Math.abs((alphabetical.value ?? 0) - 0.815)).toBeGreaterThan(0.01);
    // Interval level on ordered labels uses ranks 1..5, i.e. the original numbers.
    expect(krippendorffAlpha(relabelled, { level: "interval", categories: words }).value).toBeCloseTo(0.849, 3);
    expect(() => krippendorffAlpha(relabelled, { level: "interval" })).toThrow(/numeric ratings or an ordered categories/);
  });
});

describe("krippendorffAlpha — bootstrap interval", () => {
  it("is reproducible for a seed, brackets the estimate and changes with the seed", () => {
    const a = krippendorffAlpha(KRIPPENDORFF_2011, { level: "interval", bootstrap: { samples: 1000, seed: 42 } });
    const b = krippendorffAlpha(KRIPPENDORFF_2011, { level: "interval", bootstrap: { samples: 1000, seed: 42 } });
    const c = krippendorffAlpha(KRIPPENDORFF_2011, { level: "interval", bootstrap: { samples: 1000, seed: 43 } });
    expect(a.ci95).toBeDefined();
    expect(a.ci95).toEqual(b.ci95);
    expect(c.ci95).not.toEqual(a.ci95);
    const [lo, hi] = a.ci95!;
    expect(lo).toBeLessThan(a.value!);
    expect(hi).toBeGreaterThan(a.value!);
    expect(hi).toBeLessThanOrEqual(1);
    expect(a.bootstrap).toEqual({ samples: 1000, used: 1000, seed: 42 });
  });

  it("narrows roughly with the square root of the number of units", () => {
    // Standard large-sample behaviour of any unit-level bootstrap (Efron & Tibshirani
    // 1993): quadrupling the units by replication should about halve the width.
    const small = krippendorffAlpha(KRIPPENDORFF_2011, { level: "nominal", bootstrap: { samples: 2000, seed: 5 } });
    const big = krippendorffAlpha([...KRIPPENDORFF_2011, ...KRIPPENDORFF_2011, ...KRIPPENDORFF_2011, ...KRIPPENDORFF_2011], {
      level: "nominal",
      bootstrap: { samples: 2000, seed: 5 },
    });
    const ratio = (big.ci95![1] - big.ci95![0]) / (small.ci95![1] - small.ci95![0]);
    expect(ratio).toBeGreaterThan(0.4);
    expect(ratio).toBeLessThan(0.62);
  });
});
