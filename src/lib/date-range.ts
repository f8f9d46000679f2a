// Report date ranges as YYYY-MM-DD strings in the reader's calendar, kept in the URL.

/** A local calendar date as YYYY-MM-DD. */
export function isoDay(d: Date): string {
  const pad = (n: number) => String(n).padStart(2, "0");
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}`;
}

/** YYYY-MM-DD of today minus `days`. */
export function daysAgo(days: number, now = new Date()): string {
  const d = new Date(now);
  d.setDate(d.getDate() - days);
  return isoDay(d);
}

/** True for a well-formed YYYY-MM-DD that names a real date. */
export function isIsoDay(s: string | null | undefined): s is string {
  if (!s || !/^\d{4}-\d{2}-\d{2}$/.test(s)) return false;
  const d = new Date(`${s}T00:00:00`);
  return !Number.isNaN(d.getTime()) && isoDay(d) === s;
}
