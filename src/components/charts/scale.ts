// Small helpers shared by the report charts: "nice" tick values for count axes and the
// axis colours.

/** About `count` round tick values covering [lo, hi] (steps of 1, 2 or 5 × 10^k). */
export function niceTicks(lo: number, hi: number, count = 5): number[] {
  if (!(hi > lo)) return [lo];
  const raw = (hi - lo) / count;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? raw;
  const ticks: number[] = [];
  for (let v = Math.ceil(lo / step) * step; v <= hi + step * 1e-9; v += step) ticks.push(Number(v.toFixed(10)));
  return ticks;
}

/** The top of a count axis: the maximum rounded up to a nice tick, at least 1. */
export function niceMax(max: number): number {
  const ticks = niceTicks(0, Math.max(1, max) * 1.0001, 4);
  const last = ticks[ticks.length - 1];
  return last >= max ? last : last + (ticks[1] - ticks[0]);
}

export const AXIS = { text: "#4b5a68", line: "#bcc5cd", grid: "#e9edf0", ink: "#1a2c3d" } as const;

/** Tick text on every chart axis. */
export const AXIS_TICK = { fontSize: 11, fill: AXIS.text } as const;
