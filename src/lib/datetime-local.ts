// Converting between <input type="datetime-local"> values (local wall time, no zone) and the
// ISO date-times with an offset that the API stores, so the scan time keeps its time zone.
const pad = (n: number) => String(Math.abs(Math.trunc(n))).padStart(2, "0");

/** "2026-03-12T14:05:00+01:00" for a Date, in the browser's time zone. */
export function toIsoWithOffset(date: Date): string {
  const offset = -date.getTimezoneOffset();
  const sign = offset >= 0 ? "+" : "-";
  return (
    `${date.getFullYear()}-${pad(date.getMonth() + 1)}-${pad(date.getDate())}` +
    `T${pad(date.getHours())}:${pad(date.getMinutes())}:${pad(date.getSeconds())}` +
    `${sign}${pad(offset / 60)}:${pad(offset % 60)}`
  );
}

/** The datetime-local value ("2026-03-12T14:05") for an ISO date-time; "" when unreadable. */
export function isoToLocalInput(iso: string | null | undefined): string {
  if (!iso) return "";
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return "";
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}T${pad(d.getHours())}:${pad(d.getMinutes())}`;
}

/** The ISO date-time with offset for a datetime-local value; "" when empty or unreadable. */
export function localInputToIso(value: string): string {
  if (!value) return "";
  const d = new Date(value);
  return Number.isNaN(d.getTime()) ? "" : toIsoWithOffset(d);
}

/** Now, to the minute, as an ISO date-time with offset (the default "performed at"). */
export function nowToTheMinute(): string {
  const d = new Date();
  d.setSeconds(0, 0);
  return toIsoWithOffset(d);
}
