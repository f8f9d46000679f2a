// Degenerate and malformed input: the documented rules of index.ts (value null with a
// reason, never NaN/Infinity; clear errors for structurally bad input).
import { describe, expect, it } from "vitest";
import { cohensKappa, fleissKappa, gwetAC1, icc, krippendorffAlpha, percentAgreement } from "./index";

const finiteOrNull = (x: unknown): boolean =>
  JSON.stringify(x, (_k, v) => (typeof v === "number" && !Number.isFinite(v) ? "NOT FINITE" : v)).includes("NOT FINITE") === false;

const ALL = {
  percent: (m: (number | string | null)[][]) => percentAgreement(m),
  cohen: (m: (number | string | null)[][]) => cohensKappa(m, { weights: "quadratic" }),
  fleiss: (m: (number | string | null)[][]) => fleissKappa(m),
  ac1: (m: (number | string | null)[][]) => gwetAC1(m),
  alphaNominal: (m: (number | string | null)[][]) => krippendorffAlpha(m, { level: "nominal" }),
  alphaOrdinal: (m: (number | string | null)[][]) => krippendorffAlpha(m, { level: "ordinal", bootstrap: { samples: 50, seed: 1 } }),
  alphaInterval: (m: (number | string | null)[][]) => krippendorffAlpha(m, { level: "interval" }),
};

describe("degenerate input", () => {
  it("empty matrix: null with a reason everywhere", () => {
    for (const [name, f] of Object.entries(ALL)) {
      const r = f([]);
      expect(r.value, name).toBeNull();
      expect(r.reason, name).toMatch(/\w/);
    }
    const r = icc([], { model: "oneway", unit: "single" });
    expect(r.value).toBeNull();
    expect(r.ci95).toBeNull();
    expect(r.reason).toMatch(/\w/);
  });

  it("every rater uses the same single category: chance-corrected coefficients are null, agreement is 1", () => {
    const m = [
      [2, 2],
      [2, 2],
      [2, 2],
      [2, 2],
    ];
    expect(percentAgreement(m).value).toBe(1);
    for (const [name, f] of Object.entries(ALL)) {
      if (name === "percent") continue;
      const r = f(m);
      expect(r.value, name).toBeNull();
      expect(r.reason, name).toMatch(/one|single|identical|category/);
      expect(finiteOrNull(r), name).toBe(true);
    }
    // With the full list of possible scores, AC1 is defined: pe = 0 and AC1 = 1.
    expect(gwetAC1(m, { categories: [1, 2, 3] })).toMatchObject({ value: 1, se: 0, ci95: [1, 1] });
    expect(icc(m, { model: "twoway-random", unit: "single" }).value).toBeNull();
  });

  it("one unit, or no unit with two ratings: null", () => {
    for (const m of [
      [[1, 2, 1]],
      [
        [1, null, null],
        [null, 2, null],
        [null, null, 3],
      ],
    ]) {
      for (const [name, f] of Object.entries(ALL)) {
        if (name === "percent" && m.length === 1) continue;
        const r = f(m.map((row) => row.slice(0, name === "cohen" ? 2 : 3)));
        expect(r.value, name).toBeNull();
        expect(r.reason, name).toMatch(/\w/);
      }
    }
    // One unit still has a well-defined raw agreement: 1 agreeing pair out of 3.
    expect(percentAgreement([[1, 2, 1]]).value).toBeCloseTo(1 / 3, 14);
    expect(icc([[1, 2, 3]], { model: "twoway-mixed", unit: "average" }).value).toBeNull();
  });

  it("perfect agreement with chance agreement below 1 gives 1 with a zero-width interval", () => {
    const m = [
      [1, 1],
      [2, 2],
      [3, 3],
      [1, 1],
    ];
    expect(cohensKappa(m)).toMatchObject({ value: 1, se: 0, ci95: [1, 1] });
    expect(fleissKappa(m)).toMatchObject({ value: 1, se: 0, ci95: [1, 1] });
    expect(krippendorffAlpha(m, { level: "nominal" }).value).toBe(1);
    expect(icc(m, { model: "twoway-random", unit: "single" })).toMatchObject({ value: 1, ci95: [1, 1] });
    expect(icc(m, { model: "oneway", unit: "average" })).toMatchObject({ value: 1, ci95: [1, 1] });
  });

  it("ICC without between-unit variance: single-measure defined, average-measure null", () => {
    // Rows identical in mean: MSR = 0. ICC(1,1) = −MSW/((k − 1)MSW) = −1/(k − 1).
    const m = [
      [1, 3],
      [3, 1],
      [2, 2],
    ];
    expect(icc(m, { model: "oneway", unit: "single" }).value).toBeCloseTo(-1, 14);
    const avg = icc(m, { model: "oneway", unit: "average" });
    expect(avg.value).toBeNull();
    expect(finiteOrNull(avg)).toBe(true);
  });
});

describe("structurally bad input throws", () => {
  it("ragged rows", () => {
    expect(() => fleissKappa([[1, 2], [1]])).toThrow(/ragged/);
    expect(() =>
      icc(
        [
          [1, 2],
          [1, 2, 3],
        ],
        { model: "oneway", unit: "single" },
      ),
    ).toThrow(/ragged/);
  });

  it("cohensKappa with other than two columns", () => {
    expect(() =>
      cohensKappa([
        [1, 2, 3],
        [1, 2, 3],
      ]),
    ).toThrow(/exactly 2/);
    expect(() => cohensKappa([[1], [2]])).toThrow(/exactly 2/);
  });

  it("bad cells, unknown categories and unknown options", () => {
    expect(() => percentAgreement([[1, Number.NaN]])).toThrow(/finite number/);
    expect(() => percentAgreement([[1, undefined as unknown as null]])).toThrow(/null/);
    expect(() => percentAgreement([[1, ""]])).toThrow(/non-empty/);
    expect(() => fleissKappa([[1, 4]], { categories: [1, 2, 3] })).toThrow(/not among the given categories/);
    expect(() => fleissKappa([[1, 2]], { categories: [1, 2, 2] })).toThrow(/duplicate/);
    expect(() => cohensKappa([[1, 2]], { weights: "cubic" as "linear" })).toThrow(/weights/);
    expect(() => krippendorffAlpha([[1, 2]], { level: "fuzzy" as "nominal" })).toThrow(/level/);
    expect(() =>
      krippendorffAlpha(
        [
          [1, 2],
          [3, 2],
        ],
        { level: "ratio", categories: [-1, 1, 2, 3] },
      ),
    ).toThrow(/non-negative/);
    expect(() => icc([[1, "a"]], { model: "oneway", unit: "single" })).toThrow(/not a number/);
    expect(() => icc([[1, 2]], { model: "twoway", unit: "single" } as never)).toThrow(/model/);
  });
});

describe("category identity and order", () => {
  it("numeric strings are the number they spell", () => {
    const asNumbers = [
      [1, 2],
      [2, 2],
      [3, 1],
      [1, 1],
      [3, 3],
    ];
    const mixed = [
      ["1", 2],
      ["2.0", "2"],
      [3, "1"],
      [1, "01"],
      ["3", 3],
    ];
    expect(cohensKappa(mixed, { weights: "linear" })).toEqual(cohensKappa(asNumbers, { weights: "linear" }));
  });

  it("string labels without an order sort naturally (grade 2 before grade 10)", () => {
    // Ordinal alpha depends on the order; natural order must equal the explicit one.
    const m = [
      ["grade 2", "grade 10"],
      ["grade 9", "grade 10"],
      ["grade 2", "grade 2"],
      ["grade 10", "grade 9"],
    ];
    expect(krippendorffAlpha(m, { level: "ordinal" }).value).toBeCloseTo(
      krippendorffAlpha(m, { level: "ordinal", categories: ["grade 2", "grade 9", "grade 10"] }).value!,
      14,
    );
    expect(krippendorffAlpha(m, { level: "ordinal" }).value).not.toBeCloseTo(
      krippendorffAlpha(m, { level: "ordinal", categories: ["grade 10", "grade 2", "grade 9"] }).value!,
      6,
    );
  });
});
