// A plain SVG column chart with the count written above each column and the category
// below it. Hidden from assistive technology: the table beside it carries the figures.
import { AXIS, linear, niceMax, niceTicks } from "./scale";

export function BarChart({ bars, colour, height = 220 }: { bars: { label: string; value: number }[]; colour: string; height?: number }) {
  const width = 560;
  const top = 20;
  const bottom = 30;
  const left = 40;
  const right = 10;
  const max = niceMax(Math.max(0, ...bars.map((b) => b.value)));
  const y = linear([0, max], [height - bottom, top]);
  const band = (width - left - right) / Math.max(1, bars.length);
  return (
    <svg viewBox={`0 0 ${width} ${height}`} width="100%" aria-hidden="true" className="font-sans">
      {niceTicks(0, max, 4).map((t) => (
        <g key={t}>
          <line x1={left} x2={width - right} y1={y(t)} y2={y(t)} stroke={AXIS.grid} />
          <text x={left - 6} y={y(t) + 4} textAnchor="end" fontSize={11} fill={AXIS.text}>
            {t}
          </text>
        </g>
      ))}
      {bars.map((b, i) => {
        const cx = left + band * i + band / 2;
        const w = Math.min(64, band * 0.6);
        return (
          <g key={b.label}>
            <rect x={cx - w / 2} y={y(b.value)} width={w} height={Math.max(0, y(0) - y(b.value))} fill={colour} rx={2} />
            <text x={cx} y={y(b.value) - 5} textAnchor="middle" fontSize={12} fontWeight={600} fill={AXIS.ink}>
              {b.value}
            </text>
            <text x={cx} y={height - bottom + 16} textAnchor="middle" fontSize={12} fill={AXIS.text}>
              {b.label}
            </text>
          </g>
        );
      })}
      <line x1={left} x2={width - right} y1={y(0)} y2={y(0)} stroke={AXIS.line} />
    </svg>
  );
}
