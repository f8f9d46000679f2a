import { describe, expect, it } from "vitest";
import { cohensKappa, fleissKappa, gwetAC1, mulberry32, percentAgreement } from "./index";

/** Expand a contingency table (rows: rater A's category, columns: rater B's) into a ratings matrix. */
function fromTable(table: number[][], labels: (string | number)[]): (string | number)[][] {
  const out: (string | number)[][] = [];
  table.forEach((row, i) =>
    row.forEach((count, j) => {
      for (let c = 0; c < count; c++) out.push([labels[i], labels[j]]);
    }),
  );
  return out;
}

/** Expand per-unit category counts (units × categories) into rows of ratings. */
function fromCounts(counts: number[][]): number[][] {
  return counts.map((row) => row.flatMap((count, k) => new Array<number>(count).fill(k + 1)));
}

describe("cohensKappa — textbook examples", () => {
  it("two-category example: po = .70, pe = .50 gives kappa .40", () => {
    // Widely used teaching table (from memory): 50 units, yes/yes 20, yes/no 5,
    // no/yes 10, no/no 15. By hand: po = 35/50 = .70; rater A says yes 25/50, rater B
    // 30/50, so pe = .5·.6 + .5·.4 = .50 and κ = (.70 − .50)/(1 − .50) = .40.
    const r = cohensKappa(
      fromTable(
        [
          [20, 5],
          [10, 15],
        ],
        ["yes", "no"],
      ),
    );
    expect(r.value).toBeCloseTo(0.4, 12);
    expect(r.units).toBe(50);
  });

  it("three diagnostic categories (Fleiss, Levin & Paik 2003, ch. 18, from memory) gives .68", () => {
    // Proportions for 100 subjects (psychotic / neurotic / organic):
    // .75 .01 .04 / .05 .04 .01 / .00 .00 .10 → po = .89, pe = .66, κ = .23/.34 = .676.
    const r = cohensKappa(
      fromTable(
        [
          [75, 1, 4],
          [5, 4, 1],
          [0, 0, 10],
        ],
        ["psychotic", "neurotic", "organic"],
      ),
    );
    expect(r.value).toBeCloseTo(0.23 / 0.34, 12);
    expect(r.se).toBeGreaterThan(0);
    expect(r.ci95![0]).toBeLessThan(r.value!);
    expect(r.ci95![1]).toBeGreaterThan(r.value!);
  });

  it("high-prevalence table: kappa near zero while agreement is 94% (the paradox AC1 addresses)", () => {
    // Gwet (2008) illustrates the kappa paradoxes with tables like this one (counts from
    // memory): 125 units, +/+ 118, +/− 5, −/+ 2, −/− 0. By hand: po = .944,
    // pe = .984·.96 + .016·.04 = .94528, κ = (.944 − .94528)/(1 − .94528) = −.0233918.
    const m = fromTable(
      [
        [118, 5],
        [2, 0],
      ],
      ["+", "-"],
    );
    expect(cohensKappa(m).value).toBeCloseTo(-0.0233918128655, 10);
    // Gwet's AC1 for two raters, q = 2: π+ = (.984 + .96)/2 = .972, pe = 2·.972·.028 =
    // .054432, AC1 = (.944 − .054432)/(1 − .054432) = .9407763.
    expect(gwetAC1(m).value).toBeCloseTo(0.9407763376087, 10);
    expect(percentAgreement(m).value).toBeCloseTo(0.944, 12);
  });

  it("weights use category positions, so ordered labels and integer codes agree", () => {
    // Cohen (1968) weighted kappa is defined on the ordered scale; relabelling the
    // scale with words in the same order must not change it.
    const codes = [
      [1, 1],
      [1, 2],
      [2, 2],
      [2, 3],
      [3, 3],
      [3, 1],
      [2, 2],
      [1, 1],
      [3, 2],
    ];
    const words = ["poor", "fair", "good"];
    const labelled = codes.map((row) => row.map((v) => words[v - 1]));
    for (const weights of ["linear", "quadratic"] as const) {
      const a = cohensKappa(codes, { weights });
      const b = cohensKappa(labelled, { weights, categories: words });
      expect(b.value).toBeCloseTo(a.value!, 14);
      expect(b.se).toBeCloseTo(a.se!, 14);
    }
    // Without an order, "fair" < "good" < "poor" alphabetically: a different scale.
    expect(cohensKappa(labelled, { weights: "linear" }).value).not.toBeCloseTo(cohensKappa(codes, { weights: "linear" }).value!, 6);
  });

  it("drops rows with a missing rating", () => {
    const full = [
      [1, 1],
      [2, 2],
      [1, 2],
      [2, 2],
      [1, 1],
    ];
    const withGaps = [...full, [1, null], [null, 2], [null, null]];
    expect(cohensKappa(withGaps)).toEqual(cohensKappa(full));
  });
});

describe("fleissKappa — 10 subjects × 14 raters, 5 categories", () => {
  // The widely reproduced teaching example of Fleiss' kappa (from memory; the category
  // totals 20, 28, 39, 21, 32 out of 140 were checked): P̄ = .378, P̄e = .213, κ = .210.
  const COUNTS = [
    [0, 0, 0, 0, 14],
    [0, 2, 6, 4, 2],
    [0, 0, 3, 5, 6],
    [0, 3, 9, 2, 0],
    [2, 2, 8, 1, 1],
    [7, 7, 0, 0, 0],
    [3, 2, 6, 3, 0],
    [2, 5, 3, 2, 2],
    [6, 5, 2, 1, 0],
    [0, 2, 2, 3, 7],
  ];
  const m = fromCounts(COUNTS);

  it("gives kappa .210", () => {
    const r = fleissKappa(m);
    expect(r.value).toBeCloseTo(0.21, 3);
    expect(r.units).toBe(10);
  });

  it("percent agreement equals Fleiss' mean pairwise agreement P̄ = .378", () => {
    expect(percentAgreement(m).value).toBeCloseTo(0.378, 3);
  });

  it("does not depend on which rater column holds which rating", () => {
    const shuffled = m.map((row, i) => [...row.slice(i % 14), ...row.slice(0, i % 14)]);
    expect(fleissKappa(shuffled).value).toBeCloseTo(fleissKappa(m).value!, 14);
  });
});

describe("fleissKappa and Cohen's kappa agree where the definitions coincide", () => {
  it("with two raters, Fleiss' kappa is Scott's pi, which equals Cohen's kappa when marginals are equal", () => {
    // Fleiss (1971) reduces to Scott (1955) pi for two raters; pi and kappa coincide
    // when both raters have the same marginal distribution (symmetric table).
    const m = fromTable(
      [
        [10, 3, 1],
        [3, 8, 2],
        [1, 2, 6],
      ],
      [1, 2, 3],
    );
    expect(fleissKappa(m).value).toBeCloseTo(cohensKappa(m).value!, 12);
  });
});

describe("analytic standard errors agree with the jackknife", () => {
  // The linearised (delta-method) variances of Fleiss, Cohen & Everitt (1969) and Gwet
  // (2008) are asymptotically equal to the leave-one-unit-out jackknife variance
  // (Quenouille 1956; Efron 1982): (n − 1)/n · Σ (θ₍ᵢ₎ − θ̄)². With 300 units the two
  // should agree within a few percent; a wrong term in the variance formula would not.
  const rand = mulberry32(3);
  const int = (lo: number, hi: number): number => lo + Math.floor(rand() * (hi - lo + 1));
  const ratings = (units: number, raters: number, missing: number): (number | null)[][] =>
    Array.from({ length: units }, () => {
      const truth = int(0, 2);
      return Array.from({ length: raters }, () => (rand() < missing ? null : rand() < 0.6 ? truth : int(0, 2)));
    });
  const jackknife = (m: (number | null)[][], stat: (x: (number | null)[][]) => number | null): number => {
    const n = m.length;
    const leaveOut = m.map((_, i) => stat(m.filter((__, j) => j !== i))!);
    const mean = leaveOut.reduce((a, b) => a + b, 0) / n;
    return Math.sqrt(((n - 1) / n) * leaveOut.reduce((s, t) => s + (t - mean) ** 2, 0));
  };

  it.each([
    [4, 0],
    [4, 0.3],
    [3, 0.2],
  ])("Fleiss' kappa and AC1 with %i raters, %s missing", (raters, missing) => {
    const m = ratings(300, raters, missing);
    expect(Math.abs(fleissKappa(m).se! / jackknife(m, (x) => fleissKappa(x).value) - 1)).toBeLessThan(0.05);
    expect(Math.abs(gwetAC1(m).se! / jackknife(m, (x) => gwetAC1(x).value) - 1)).toBeLessThan(0.05);
  });

  it("Cohen's kappa, unweighted and quadratic", () => {
    const m = ratings(300, 2, 0);
    for (const weights of ["unweighted", "quadratic"] as const)
      expect(Math.abs(cohensKappa(m, { weights }).se! / jackknife(m, (x) => cohensKappa(x, { weights }).value) - 1)).toBeLessThan(0.05);
  });
});
