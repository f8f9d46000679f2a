// A plain SVG line chart over ordered categories (weeks). Each series is labelled at its
// last point instead of in a legend; a missing value breaks the line. Hidden from
// assistive technology: the table beside it carries the figures.
import { AXIS, linear, niceMax, niceTicks } from "./scale";

export interface LineSeries {
  name: string;
  colour: string;
  dashed?: boolean;
  values: (number | null)[];
}

export function LineChart({
  categories,
  series,
  formatCategory,
  unit,
}: {
  categories: string[];
  series: LineSeries[];
  formatCategory: (c: string) => string;
  unit: string;
}) {
  const width = 640;
  const height = 240;
  const top = 26;
  const bottom = 30;
  const left = 44;
  const right = 120;
  const max = niceMax(Math.max(0, ...series.flatMap((s) => s.values.filter((v): v is number => v !== null))));
  const y = linear([0, max], [height - bottom, top]);
  const x = (i: number) => (categories.length <= 1 ? (left + width - right) / 2 : left + (i / (categories.length - 1)) * (width - left - right));
  const every = Math.max(1, Math.ceil(categories.length / 8));
  // Direct labels at each series' last point, nudged apart when they would overlap.
  const ends = series
    .map((s) => {
      const i = s.values
        .map((v, k) => (v === null ? -1 : k))
        .filter((k) => k >= 0)
        .pop();
      return i === undefined ? null : { s, i, y: y(s.values[i]!) };
    })
    .filter((e): e is { s: LineSeries; i: number; y: number } => e !== null)
    .sort((a, b) => a.y - b.y);
  for (let k = 1; k < ends.length; k++) if (ends[k].y - ends[k - 1].y < 14) ends[k].y = ends[k - 1].y + 14;
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
      <text x={4} y={top - 14} fontSize={11} fill={AXIS.text}>
        {unit}
      </text>
      {categories.map((c, i) =>
        i % every === 0 ? (
          <text key={c} x={x(i)} y={height - bottom + 16} textAnchor="middle" fontSize={11} fill={AXIS.text}>
            {formatCategory(c)}
          </text>
        ) : null,
      )}
      {series.map((s) => {
        const segments: string[] = [];
        let d = "";
        s.values.forEach((v, i) => {
          if (v === null) {
            if (d) segments.push(d);
            d = "";
          } else d += `${d ? "L" : "M"}${x(i).toFixed(1)},${y(v).toFixed(1)}`;
        });
        if (d) segments.push(d);
        return (
          <g key={s.name}>
            {segments.map((p, k) => (
              <path key={k} d={p} fill="none" stroke={s.colour} strokeWidth={2} strokeDasharray={s.dashed ? "6 4" : undefined} />
            ))}
            {s.values.map((v, i) => (v === null ? null : <circle key={i} cx={x(i)} cy={y(v)} r={3} fill={s.colour} />))}
          </g>
        );
      })}
      {ends.map((e) => (
        <text key={e.s.name} x={x(e.i) + 8} y={e.y + 4} fontSize={12} fontWeight={600} fill={AXIS.ink}>
          {e.s.name}
        </text>
      ))}
    </svg>
  );
}
