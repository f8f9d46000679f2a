import { describe, expect, it } from "vitest";
import { wilsonInterval } from "./index";

describe("wilsonInterval — Newcombe (1998) Table I, method 3 (score interval without continuity correction)", () => {
  // Values from memory of Newcombe (1998), Statistics in Medicine 17:857–872.
  it.each([
    [81, 263, 0.2553, 0.3662],
    [15, 148, 0.0624, 0.1605],
    [0, 20, 0, 0.1611],
    [1, 29, 0.0061, 0.1718],
  ])("%i/%i → %s to %s", (x, n, lo, hi) => {
    const [l, h] = wilsonInterval(x, n);
    expect(l).toBeCloseTo(lo, 4);
    expect(h).toBeCloseTo(hi, 4);
  });

  it("is exactly 0 or 1 at the ends and symmetric under swapping successes and failures", () => {
    // Wilson (1927): the interval for x/n mirrors the one for (n − x)/n.
    expect(wilsonInterval(0, 20)[0]).toBe(0);
    expect(wilsonInterval(20, 20)[1]).toBe(1);
    const [a, b] = wilsonInterval(7, 31, 0.9);
    const [c, d] = wilsonInterval(24, 31, 0.9);
    expect(a).toBeCloseTo(1 - d, 14);
    expect(b).toBeCloseTo(1 - c, 14);
  });

  it("widens with the confidence level", () => {
    const w = (conf: number) => {
      const [l, h] = wilsonInterval(12, 40, conf);
      return h - l;
    };
    expect(w(0.8)).toBeLessThan(w(0.95));
    expect(w(0.95)).toBeLessThan(w(0.99));
  });

  it("returns the whole range for n = 0 and rejects impossible counts", () => {
    expect(wilsonInterval(0, 0)).toEqual([0, 1]);
    expect(() => wilsonInterval(5, 4)).toThrow(RangeError);
    expect(() => wilsonInterval(-1, 4)).toThrow(RangeError);
    expect(() => wilsonInterval(1.5, 4)).toThrow(RangeError);
    expect(() => wilsonInterval(1, 4, 1)).toThrow(RangeError);
  });
});
