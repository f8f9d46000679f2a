// How figures read on every screen: counts with the locale's grouping; agreement
// coefficients to two decimals with a true minus sign; shares as percentages ("83 %" in the
// agreement and calibration tables, "87%" beside a rate); Wilson intervals and their counts.
// "—" stands for anything that could not be counted.
import type { Rate } from "../../shared/schemas/progress";

const MINUS = "\u2212";
const integer = new Intl.NumberFormat(undefined, { maximumFractionDigits: 0 });

/** Whole numbers with the locale's grouping. */
export function formatCount(n: number): string {
  return integer.format(n);
}

/** A figure with a true minus sign: −2.71 (two decimals unless told). */
export function signed(value: number, digits = 2): string {
  return value < 0 ? `${MINUS}${Math.abs(value).toFixed(digits)}` : value.toFixed(digits);
}

/** A coefficient such as kappa to two decimals ("0.74", "−0.12"); one that rounds to zero is "0.00", never "−0.00". */
export function formatCoefficient(v: number): string {
  const s = signed(v, 2);
  return s === `${MINUS}0.00` ? "0.00" : s;
}

/** "[0.41, 0.88]" */
export function formatInterval(ci: [number, number]): string {
  return `[${formatCoefficient(ci[0])}, ${formatCoefficient(ci[1])}]`;
}

/** A proportion as a whole percentage with a space, as the agreement tables write it ("83 %"). */
export function formatPercent(p: number): string {
  return `${Math.round(p * 100)} %`;
}

/** 0.873 → "87%" (null → "—"). */
export function percent(value: number | null | undefined, digits = 0): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  // Whole percentages round the way the interval's lower bound does (Math.round), so both ends of "87% (72–95%)" agree.
  return digits === 0 ? `${Math.round(value * 100)}%` : `${(value * 100).toFixed(digits)}%`;
}

/** A rate with its Wilson 95% interval: "87% (72–95%)", or "—" when nothing was counted. */
export function rateText(r: Rate): string {
  if (r.value === null || r.n === 0) return "—";
  return `${percent(r.value)} (${Math.round(r.ci95[0] * 100)}–${percent(r.ci95[1])})`;
}

/** "13 of 15" for a rate, or "none" when nothing was counted. */
export function rateCount(r: Rate): string {
  return r.n === 0 ? "none" : `${r.successes} of ${r.n}`;
}

/** The Landis & Koch band in words, capitalised for a table cell ("Substantial agreement"). */
export function bandWords(band: string | null): string {
  if (!band) return "—";
  return `${band[0].toUpperCase()}${band.slice(1)} agreement`;
}
