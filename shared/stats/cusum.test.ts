import { describe, expect, it } from "vitest";
import { cusum } from "./index";

const PARAMS = { p0: 0.1, p1: 0.2, alpha: 0.1, beta: 0.1 };

describe("cusum — learning-curve CUSUM", () => {
  it("computes s and the limits for p0 = .1, p1 = .2, α = β = .1", () => {
    // Recomputed by hand from Wald's (1945) SPRT: P = ln 2 = .693147, Q = ln(.9/.8) =
    // .117783, s = Q/(P + Q) = .145244; h1 = ln(.9/.1)/(P + Q) = 2.197225/.810930 =
    // 2.709511 and h0 = −ln(.9/.1)/(P + Q) = −2.709511 (α = β makes them symmetric).
    const r = cusum([], PARAMS);
    expect(r.s).toBeCloseTo(0.145244, 6);
    expect(r.h1).toBeCloseTo(2.709511, 6);
    expect(r.h0).toBeCloseTo(-2.709511, 6);
    expect(r.path).toEqual([]);
    expect(r.signal).toBe("none");
    expect(r.signalAt).toBeNull();
  });

  it("scaled path equals Wald's log-likelihood ratio and the limits equal Wald's boundaries", () => {
    // Wald (1945): after f failures in t trials, ln Λ = f·ln(p1/p0) + (t − f)·ln((1 − p1)/(1 − p0));
    // accept H1 when ln Λ ≥ ln((1 − β)/α), accept H0 when ln Λ ≤ ln(β/(1 − α)).
    const params = { p0: 0.05, p1: 0.15, alpha: 0.05, beta: 0.2 };
    const outcomes = [false, true, false, false, false, true, true, false, false, false, false, true];
    const r = cusum(outcomes, params);
    const scale = Math.log((params.p1 * (1 - params.p0)) / (params.p0 * (1 - params.p1)));
    let failures = 0;
    outcomes.forEach((failed, t) => {
      if (failed) failures += 1;
      const llr = failures * Math.log(params.p1 / params.p0) + (t + 1 - failures) * Math.log((1 - params.p1) / (1 - params.p0));
      expect(r.path[t] * scale).toBeCloseTo(llr, 12);
    });
    expect(r.h1 * scale).toBeCloseTo(Math.log((1 - params.beta) / params.alpha), 12);
    expect(r.h0 * scale).toBeCloseTo(Math.log(params.beta / (1 - params.alpha)), 12);
  });

  it("signals competent at the first attempt whose success takes the path to h0 or below", () => {
    // 18·s = 2.6144 > 2.7095 > 19·s = 2.7596: the 19th success (index 18) crosses h0.
    const r = cusum(new Array<boolean>(25).fill(false), PARAMS);
    expect(r.signal).toBe("competent");
    expect(r.signalAt).toBe(18);
    expect(r.path[17]).toBeGreaterThan(r.h0);
    expect(r.path[18]).toBeLessThanOrEqual(r.h0);
    expect(r.path).toHaveLength(25);
  });

  it("signals unacceptable when failures take the path to h1 and keeps only the first signal", () => {
    // Each failure adds 1 − s = .854756: three give 2.564, four give 3.419 ≥ h1 (index 3).
    const r = cusum([true, true, true, true, ...new Array<boolean>(60).fill(false)], PARAMS);
    expect(r.signal).toBe("unacceptable");
    expect(r.signalAt).toBe(3);
    // The path later falls below h0, but the sequential test had already stopped.
    expect(r.path[r.path.length - 1]).toBeLessThan(r.h0);
  });

  it("stays at none while between the limits", () => {
    const r = cusum([false, true, false, false, true, false], PARAMS);
    expect(r.signal).toBe("none");
    expect(r.signalAt).toBeNull();
    expect(r.path[5]).toBeCloseTo(2 * (1 - r.s) - 4 * r.s, 12);
  });

  it("rejects parameters that do not define the test", () => {
    expect(() => cusum([], { ...PARAMS, p1: 0.05 })).toThrow(/p1/);
    expect(() => cusum([], { ...PARAMS, alpha: 0 })).toThrow(/alpha/);
    expect(() => cusum([], { ...PARAMS, alpha: 0.6, beta: 0.5 })).toThrow(/alpha \+ beta/);
    expect(() => cusum([true, 1 as unknown as boolean], PARAMS)).toThrow(/not a boolean/);
  });
});
