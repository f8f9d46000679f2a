import { describe, expect, it } from "vitest";
import { agreementBand } from "./index";

// Landis & Koch (1977), Biometrics 33:159–174, p. 165: <0 poor, .00–.20 slight,
// .21–.40 fair, .41–.60 moderate, .61–.80 substantial, .81–1.00 almost perfect.
describe("agreementBand — Landis & Koch (1977)", () => {
  it.each([
    [-0.3, "poor"],
    [-0.0001, "poor"],
    [0, "slight"],
    [0.2, "slight"],
    [0.2000001, "fair"],
    [0.21, "fair"],
    [0.4, "fair"],
    [0.41, "moderate"],
    [0.6, "moderate"],
    [0.6000001, "substantial"],
    [0.8, "substantial"],
    [0.81, "almost perfect"],
    [1, "almost perfect"],
  ] as const)("%s → %s", (value, band) => {
    expect(agreementBand(value)).toBe(band);
  });

  it("treats floating-point noise at a limit as the limit", () => {
    expect(0.4 + 0.2).toBeGreaterThan(0.6);
    expect(agreementBand(0.4 + 0.2)).toBe("moderate");
    expect(agreementBand(0.7 - 0.5)).toBe("slight");
  });

  it("passes null through and rejects impossible values", () => {
    expect(agreementBand(null)).toBeNull();
    expect(() => agreementBand(1.2)).toThrow(RangeError);
    expect(() => agreementBand(Number.NaN)).toThrow(RangeError);
  });
});
