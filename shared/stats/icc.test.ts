import { describe, expect, it } from "vitest";
import { icc } from "./index";

// Shrout & Fleiss (1979), Table 2: 6 targets (rows) × 4 judges (columns). Published in
// Table 4 of the paper: ICC(1,1) .17, ICC(2,1) .29, ICC(3,1) .71, ICC(1,4) .44,
// ICC(2,4) .62, ICC(3,4) .91 (data and values from memory; the ANOVA mean squares of
// Table 3, BMS 11.24, WMS 6.26, JMS 32.49, EMS 1.02, reproduce them).
const SHROUT_FLEISS = [
  [9, 2, 5, 8],
  [6, 1, 3, 2],
  [8, 4, 6, 8],
  [7, 1, 2, 6],
  [10, 5, 6, 9],
  [6, 2, 4, 7],
];

// The 95% limits for the same data as printed (two decimals) in the example output of
// the ICC function of Revelle's psych package for R, which implements Shrout & Fleiss /
// McGraw & Wong (from memory).
const CASES = [
  ["oneway", "single", 0.17, -0.13, 0.72],
  ["twoway-random", "single", 0.29, 0.02, 0.76],
  ["twoway-mixed", "single", 0.71, 0.34, 0.95],
  ["oneway", "average", 0.44, -0.88, 0.91],
  ["twoway-random", "average", 0.62, 0.07, 0.93],
  ["twoway-mixed", "average", 0.91, 0.68, 0.99],
] as const;

describe("icc — Shrout & Fleiss (1979) Table 2 data", () => {
  it.each(CASES)("%s %s: ICC %s, 95%% CI %s to %s", (model, unit, value, lo, hi) => {
    const r = icc(SHROUT_FLEISS, { model, unit });
    expect(r.value).toBeCloseTo(value, 2);
    expect(r.ci95![0]).toBeCloseTo(lo, 2);
    expect(r.ci95![1]).toBeCloseTo(hi, 2);
    expect(r.units).toBe(6);
    expect(r.raters).toBe(4);
  });

  it("agrees with the ICC formulas applied to the paper's rounded mean squares (Table 3)", () => {
    // Shrout & Fleiss (1979) Table 3 (from memory): BMS 11.24, WMS 6.26, JMS 32.49,
    // EMS 1.02, k = 4, n = 6. Rounding of the mean squares moves the ICCs by < 5e-4.
    const [bms, wms, jms, ems, k, n] = [11.24, 6.26, 32.49, 1.02, 4, 6];
    const within = (model: "oneway" | "twoway-random" | "twoway-mixed") => icc(SHROUT_FLEISS, { model, unit: "single" }).value!;
    expect(within("oneway")).toBeCloseTo((bms - wms) / (bms + (k - 1) * wms), 3);
    expect(within("twoway-random")).toBeCloseTo((bms - ems) / (bms + (k - 1) * ems + (k * (jms - ems)) / n), 3);
    expect(within("twoway-mixed")).toBeCloseTo((bms - ems) / (bms + (k - 1) * ems), 3);
  });

  it("drops units with a missing rating", () => {
    const withGap = [...SHROUT_FLEISS, [5, null, 4, 4]];
    expect(icc(withGap, { model: "twoway-random", unit: "single" })).toEqual(icc(SHROUT_FLEISS, { model: "twoway-random", unit: "single" }));
  });

  it("consistency ignores a constant rater offset, absolute agreement does not", () => {
    // McGraw & Wong (1996): adding a constant to one rater leaves ICC(C,1) unchanged and
    // lowers ICC(A,1).
    const shifted = SHROUT_FLEISS.map((r) => [r[0], r[1] + 10, r[2], r[3]]);
    const base = icc(SHROUT_FLEISS, { model: "twoway-mixed", unit: "single" }).value!;
    expect(icc(shifted, { model: "twoway-mixed", unit: "single" }).value).toBeCloseTo(base, 12);
    expect(icc(shifted, { model: "twoway-random", unit: "single" }).value!).toBeLessThan(icc(SHROUT_FLEISS, { model: "twoway-random", unit: "single" }).value!);
  });
});
