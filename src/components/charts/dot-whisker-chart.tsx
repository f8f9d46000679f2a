// A dot-and-whisker chart in plain SVG: one row per item, the dot at its value, the whisker
// across its interval, a reference line at zero, and the item's name and value written on
// the chart (no legend to decode). Hidden from assistive technology: the table beside it
// carries the same figures.
import { AXIS, linear, niceTicks } from "./scale";

export interface DotWhiskerRow {
  id: string;
  label: string;
  value: number;
  interval: [number, number] | null;
  colour: string;
  /** The value as written on the chart. */
  text: string;
}

export function DotWhiskerChart({ rows, referenceLabel, formatTick }: { rows: DotWhiskerRow[]; referenceLabel: string; formatTick: (v: number) => string }) {
  const width = 640;
  const rowH = 40;
  const top = 26;
  const bottom = 28;
  const left = 150;
  const right = 70;
  const height = top + rows.length * rowH + bottom;
  const reach = Math.max(0.5, ...rows.flatMap((r) => (r.interval ? r.interval.map(Math.abs) : [Math.abs(r.value)])));
  const lim = Math.ceil(reach * 4) / 4;
  const x = linear([-lim, lim], [left, width - right]);
  const ticks = niceTicks(-lim, lim, 6);
  return (
    <svg viewBox={`0 0 ${width} ${height}`} width="100%" role="presentation" aria-hidden="true" className="font-sans">
      {ticks.map((t) => (
        <g key={t}>
          <line x1={x(t)} x2={x(t)} y1={top - 6} y2={height - bottom} stroke={AXIS.grid} />
          <text x={x(t)} y={height - bottom + 16} textAnchor="middle" fontSize={11} fill={AXIS.text} className="tabular-nums">
            {formatTick(t)}
          </text>
        </g>
      ))}
      <line x1={x(0)} x2={x(0)} y1={top - 10} y2={height - bottom} stroke={AXIS.ink} strokeWidth={1.5} />
      <text x={x(0)} y={top - 14} textAnchor="middle" fontSize={11} fill={AXIS.text}>
        {referenceLabel}
      </text>
      {rows.map((r, i) => {
        const cy = top + i * rowH + rowH / 2;
        const [lo, hi] = r.interval ?? [r.value, r.value];
        return (
          <g key={r.id}>
            <text x={left - 10} y={cy + 4} textAnchor="end" fontSize={12} fill={AXIS.ink}>
              {r.label}
            </text>
            <line x1={x(lo)} x2={x(hi)} y1={cy} y2={cy} stroke="#324d66" strokeWidth={1.5} />
            <line x1={x(lo)} x2={x(lo)} y1={cy - 5} y2={cy + 5} stroke="#324d66" strokeWidth={1.5} />
            <line x1={x(hi)} x2={x(hi)} y1={cy - 5} y2={cy + 5} stroke="#324d66" strokeWidth={1.5} />
            <circle cx={x(r.value)} cy={cy} r={6} fill={r.colour} stroke={AXIS.ink} strokeWidth={1} />
            <text x={x(hi) + 8} y={cy + 4} fontSize={12} fill={AXIS.ink} className="tabular-nums">
              {r.text}
            </text>
          </g>
        );
      })}
    </svg>
  );
}
