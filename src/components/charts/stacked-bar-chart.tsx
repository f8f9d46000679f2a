// A stacked column chart (recharts): one column per week, one segment per series, a key of
// swatches and names, and each column's total written above it. One named image for
// assistive technology: the table beside it carries the figures.
import { Bar, BarChart, type BarShapeProps, Rectangle, CartesianGrid, LabelList, XAxis, YAxis } from "recharts";
import { ChartImage } from "./chart-image";
import { AXIS, AXIS_TICK, niceMax, niceTicks } from "./scale";

/** Stacked counts per category with totals on top; `label` names the chart for screen readers. */
export function StackedBarChart({
  categories,
  series,
  formatCategory,
  label,
}: {
  categories: string[];
  series: { name: string; colour: string; values: number[] }[];
  formatCategory: (c: string) => string;
  label: string;
}) {
  const totals = categories.map((_, i) => series.reduce((s, x) => s + (x.values[i] ?? 0), 0));
  const data = categories.map((c, i) => Object.fromEntries([["category", c], ["total", totals[i]], ...series.map((s, k) => [`s${k}`, s.values[i] ?? 0])]));
  const max = niceMax(Math.max(0, ...totals));
  const every = Math.max(1, Math.ceil(categories.length / 8));
  return (
    <ChartImage label={label}>
      <ul className="mb-1 flex flex-wrap gap-x-4 gap-y-1 text-xs text-ink-900">
        {series.map((s) => (
          <li key={s.name} className="inline-flex items-center gap-1.5">
            <span className="inline-block size-3 rounded-sm ring-1 ring-ink-800/30" style={{ backgroundColor: s.colour }} />
            {s.name}
          </li>
        ))}
      </ul>
      <BarChart
        responsive
        width="100%"
        height={240}
        data={data}
        margin={{ top: 18, right: 10, bottom: 4, left: 0 }}
        accessibilityLayer={false}
        title={label}
        desc={`Stacked by ${series.map((s) => s.name).join(", ")}; totals ${totals.join(", ")}.`}
      >
        <CartesianGrid vertical={false} stroke={AXIS.grid} />
        <XAxis dataKey="category" tickFormatter={formatCategory} interval={every - 1} tick={AXIS_TICK} tickLine={false} axisLine={{ stroke: AXIS.line }} />
        <YAxis domain={[0, max]} ticks={niceTicks(0, max, 4)} allowDecimals={false} tick={AXIS_TICK} tickLine={false} axisLine={false} width={40} />
        {series.map((s, k) => (
          // A thin paper edge between segments keeps neighbours apart without relying on hue.
          <Bar
            key={s.name}
            dataKey={`s${k}`}
            name={s.name}
            stackId="stack"
            fill={s.colour}
            stroke="#ffffff"
            strokeWidth={1}
            maxBarSize={48}
            isAnimationActive={false}
            // A custom shape keeps zero-height segments, so the top one still carries the week's total.
            shape={(p: BarShapeProps) => <Rectangle {...p} />}
          >
            {k === series.length - 1 ? (
              <LabelList
                dataKey="total"
                position="top"
                offset={5}
                fontSize={11}
                fontWeight={600}
                fill={AXIS.ink}
                formatter={(v: unknown) => (Number(v) > 0 ? String(v) : "")}
              />
            ) : null}
          </Bar>
        ))}
      </BarChart>
    </ChartImage>
  );
}
