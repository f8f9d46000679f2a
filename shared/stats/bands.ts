// Plain-language wording for agreement coefficients after Landis & Koch (1977), so that
// reports can say "moderate agreement" next to a kappa, alpha, AC1 or ICC.
//
// Boundary rule: each band includes its upper limit, as in the published table
// (0.00–0.20 slight, 0.21–0.40 fair, …): exactly 0.20 is "slight", 0.2000001 is "fair";
// exactly 0 is "slight", anything below 0 is "poor". Values within 1e-12 of a limit are
// treated as lying on it, so that a coefficient that is 0.2 up to floating-point noise
// (e.g. 0.20000000000000004) is not shown as "fair" next to a rounded "0.20".

export type AgreementBand = "poor" | "slight" | "fair" | "moderate" | "substantial" | "almost perfect";

const LIMITS: ReadonlyArray<[number, AgreementBand]> = [
  [0.2, "slight"],
  [0.4, "fair"],
  [0.6, "moderate"],
  [0.8, "substantial"],
  [1, "almost perfect"],
];

const SNAP = 1e-12;

/** Landis & Koch (1977) band for an agreement coefficient; null in, null out. */
export function agreementBand(value: number): AgreementBand;
export function agreementBand(value: number | null): AgreementBand | null;
export function agreementBand(value: number | null): AgreementBand | null {
  if (value === null) return null;
  if (typeof value !== "number" || !Number.isFinite(value)) throw new RangeError(`agreementBand: value must be a finite number or null (got ${String(value)})`);
  let v = value;
  for (const limit of [0, ...LIMITS.map(([l]) => l)]) if (Math.abs(v - limit) <= SNAP) v = limit;
  if (v > 1) throw new RangeError(`agreementBand: agreement coefficients cannot exceed 1 (got ${value})`);
  if (v < 0) return "poor";
  for (const [limit, band] of LIMITS) if (v <= limit) return band;
  return "almost perfect";
}
