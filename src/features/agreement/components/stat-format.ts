// How the agreement figures read: coefficients to two decimals with a true minus sign,
// percentages whole, intervals in brackets, and "—" with a reason for anything missing.

const MINUS = "\u2212";

/** A coefficient such as kappa to two decimals ("0.74", "−0.12"). */
export function formatCoefficient(v: number): string {
  const s = v.toFixed(2);
  return s.startsWith("-") ? (s === "-0.00" ? "0.00" : MINUS + s.slice(1)) : s;
}

/** A proportion as a whole percentage ("83 %"). */
export function formatPercent(p: number): string {
  return `${Math.round(p * 100)} %`;
}

/** "[0.41, 0.88]" */
export function formatInterval(ci: [number, number]): string {
  return `[${formatCoefficient(ci[0])}, ${formatCoefficient(ci[1])}]`;
}

/** Why a coefficient could not be computed, in words, when the report did not say. */
export function missingReason(units: number, percentAgreement: number | null, given?: string): string {
  if (given) return given;
  if (units === 0) return "No exam in this range was read twice for this criterion.";
  if (units < 2) return "Only one exam was read twice: one unit cannot separate agreement from chance.";
  if (percentAgreement === 1)
    return "Every reviewer gave one and the same value, so chance agreement is total and the coefficient is 0/0. Percent agreement is the figure to read.";
  return "Not computable from these reads.";
}

/** The Landis & Koch band in words, capitalised for a table cell. */
export function bandWords(band: string | null): string {
  if (!band) return "—";
  return `${band[0].toUpperCase()}${band.slice(1)} agreement`;
}
