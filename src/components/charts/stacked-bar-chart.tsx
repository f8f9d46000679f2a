// A plain SVG stacked column chart (one column per week, one segment per series) with a
// key of swatches and names, and each column's total written above it. Hidden from
// assistive technology: the table beside it carries the figures.
import { AXIS, linear, niceMax, niceTicks } from "./scale";

export function StackedBarChart({
  categories,
  series,
  formatCategory,
}: {
  categories: string[];
  series: { name: string; colour: string; values: number[] }[];
  formatCategory: (c: string) => string;
}) {
  const width = 640;
  const height = 240;
  const top = 18;
  const bottom = 30;
  const left = 40;
  const right = 10;
  const totals = categories.map((_, i) => series.reduce((s, x) => s + (x.values[i] ?? 0), 0));
  const max = niceMax(Math.max(0, ...totals));
  const y = linear([0, max], [height - bottom, top]);
  const band = (width - left - right) / Math.max(1, categories.length);
  const w = Math.min(48, band * 0.65);
  const every = Math.max(1, Math.ceil(categories.length / 8));
  return (
    <div aria-hidden="true">
      <ul className="mb-1 flex flex-wrap gap-x-4 gap-y-1 text-xs text-ink-900">
        {series.map((s) => (
          <li key={s.name} className="inline-flex items-center gap-1.5">
            <span className="inline-block size-3 rounded-sm ring-1 ring-ink-800/30" style={{ backgroundColor: s.colour }} />
            {s.name}
          </li>
        ))}
      </ul>
      <svg viewBox={`0 0 ${width} ${height}`} width="100%" className="font-sans">
        {niceTicks(0, max, 4).map((t) => (
          <g key={t}>
            <line x1={left} x2={width - right} y1={y(t)} y2={y(t)} stroke={AXIS.grid} />
            <text x={left - 6} y={y(t) + 4} textAnchor="end" fontSize={11} fill={AXIS.text}>
              {t}
            </text>
          </g>
        ))}
        {categories.map((c, i) => {
          const cx = left + band * i + band / 2;
          let base = 0;
          return (
            <g key={c}>
              {series.map((s) => {
                const v = s.values[i] ?? 0;
                const y0 = y(base);
                base += v;
                // A thin paper gap between segments keeps neighbours apart without relying on hue.
                return v > 0 ? <rect key={s.name} x={cx - w / 2} y={y(base)} width={w} height={Math.max(0, y0 - y(base) - 1)} fill={s.colour} /> : null;
              })}
              {totals[i] > 0 ? (
                <text x={cx} y={y(totals[i]) - 5} textAnchor="middle" fontSize={11} fontWeight={600} fill={AXIS.ink}>
                  {totals[i]}
                </text>
              ) : null}
              {i % every === 0 ? (
                <text x={cx} y={height - bottom + 16} textAnchor="middle" fontSize={11} fill={AXIS.text}>
                  {formatCategory(c)}
                </text>
              ) : null}
            </g>
          );
        })}
        <line x1={left} x2={width - right} y1={y(0)} y2={y(0)} stroke={AXIS.line} />
      </svg>
    </div>
  );
}
