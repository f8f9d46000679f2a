// The figures the agreement, calibration and progress screens show, written out: a true
// minus sign, no "−0.00", whole percentages that round like their intervals, and "—" for
// what could not be counted.
import { describe, expect, it } from "vitest";
import { bandWords, formatCoefficient, formatCount, formatInterval, formatPercent, percent, rateCount, rateText, signed } from "./stat-format";

const rate = (value: number | null, ci95: [number, number], successes: number, n: number) => ({ value, ci95, successes, n });

describe("coefficients and intervals", () => {
  it("writes two decimals with a true minus sign", () => {
    expect(formatCoefficient(0.7449)).toBe("0.74");
    expect(formatCoefficient(-0.125)).toBe("\u22120.13");
    expect(formatCoefficient(1)).toBe("1.00");
  });

  it("never writes a negative zero", () => {
    expect(formatCoefficient(-0.004)).toBe("0.00");
    expect(formatCoefficient(-0)).toBe("0.00");
  });

  it("brackets an interval", () => {
    expect(formatInterval([-0.2, 0.881])).toBe("[\u22120.20, 0.88]");
  });

  it("signs CUSUM figures with the digits asked for, keeping a small negative one's sign", () => {
    expect(signed(-2.7149)).toBe("\u22122.71");
    expect(signed(2.5)).toBe("2.50");
    expect(signed(-0.001)).toBe("\u22120.00");
    expect(signed(0.1234, 3)).toBe("0.123");
  });
});

describe("percentages and rates", () => {
  it("writes the agreement tables' percentages with a space", () => {
    expect(formatPercent(0.834)).toBe("83 %");
    expect(formatPercent(1)).toBe("100 %");
  });

  it("writes a rate's percentage without one, with digits when asked, and a dash for nothing", () => {
    expect(percent(0.873)).toBe("87%");
    expect(percent(0.005, 1)).toBe("0.5%");
    expect(percent(null)).toBe("—");
    expect(percent(Number.NaN)).toBe("—");
  });

  it("writes a rate with its Wilson interval and its counts", () => {
    const r = rate(13 / 15, [0.621, 0.963], 13, 15);
    expect(rateText(r)).toBe("87% (62–96%)");
    expect(rateCount(r)).toBe("13 of 15");
    expect(rateText(rate(null, [0, 1], 0, 0))).toBe("—");
    expect(rateCount(rate(null, [0, 1], 0, 0))).toBe("none");
  });
});

describe("counts and bands", () => {
  it("groups whole numbers as the locale does", () => {
    expect(formatCount(1234567)).toBe(new Intl.NumberFormat(undefined).format(1234567));
    expect(formatCount(2.6)).toBe("3");
  });

  it("names a Landis & Koch band, or a dash without one", () => {
    expect(bandWords("substantial")).toBe("Substantial agreement");
    expect(bandWords(null)).toBe("—");
  });
});
