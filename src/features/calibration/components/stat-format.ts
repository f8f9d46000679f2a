// How calibration figures read, matching the agreement report: coefficients to two
// decimals with a true minus sign, whole percentages, intervals in brackets.

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

/** The agreement band in words, capitalised for a table cell. */
export function bandWords(band: string | null): string {
  if (!band) return "—";
  return `${band[0].toUpperCase()}${band.slice(1)} agreement`;
}
