// A line chart (recharts) over ordered categories (weeks). Each series is labelled at its
// last point instead of in a legend; a missing value breaks the line. One named image for
// assistive technology: the table beside it carries the figures.
import { CartesianGrid, LabelList, Line, LineChart as RLineChart, XAxis, YAxis } from "recharts";
import { ChartImage } from "./chart-image";
import { AXIS, AXIS_TICK, niceMax, niceTicks } from "./scale";

export interface LineSeries {
  name: string;
  colour: string;
  dashed?: boolean;
  values: (number | null)[];
}

/** Where a series' direct label goes: its last point, and how far to nudge it off its neighbours. */
function endLabels(series: LineSeries[]): { index: number; dy: number }[] {
  const ends = series.map((s) => {
    let index = -1;
    s.values.forEach((v, k) => {
      if (v !== null) index = k;
    });
    return { index, value: index < 0 ? 0 : s.values[index]! };
  });
  // Series ending on the same category stack their labels 14 px apart, highest value on
  // top, so near-equal ends never print over each other.
  return ends.map((e, k) => {
    const group = ends.map((o, j) => ({ ...o, j })).filter((o) => o.index === e.index);
    group.sort((a, b) => b.value - a.value || a.j - b.j);
    const rank = group.findIndex((o) => o.j === k);
    return { index: e.index, dy: 4 + (rank - (group.length - 1) / 2) * 14 };
  });
}

/** Lines over categories with direct labels; `label` names the chart for screen readers. */
export function LineChart({
  categories,
  series,
  formatCategory,
  unit,
  label,
}: {
  categories: string[];
  series: LineSeries[];
  formatCategory: (c: string) => string;
  unit: string;
  label: string;
}) {
  const max = niceMax(Math.max(0, ...series.flatMap((s) => s.values.filter((v): v is number => v !== null))));
  const data = categories.map((c, i) => Object.fromEntries([["category", c], ...series.map((s, k) => [`s${k}`, s.values[i]])]));
  const every = Math.max(1, Math.ceil(categories.length / 8));
  const ends = endLabels(series);
  return (
    <ChartImage label={label}>
      <RLineChart
        responsive
        width="100%"
        height={240}
        data={data}
        margin={{ top: 26, right: 120, bottom: 4, left: 0 }}
        accessibilityLayer={false}
        title={label}
        desc={`${series.map((s) => s.name).join(" and ")}, in ${unit}, from ${formatCategory(categories[0] ?? "")} to ${formatCategory(categories.at(-1) ?? "")}.`}
      >
        <CartesianGrid vertical={false} stroke={AXIS.grid} />
        <XAxis
          dataKey="category"
          tickFormatter={formatCategory}
          interval={every - 1}
          tick={AXIS_TICK}
          tickLine={false}
          axisLine={{ stroke: AXIS.line }}
          padding={{ left: 12, right: 12 }}
        />
        <YAxis
          domain={[0, max]}
          ticks={niceTicks(0, max, 4)}
          tick={AXIS_TICK}
          tickLine={false}
          axisLine={false}
          width={44}
          label={{ value: unit, position: "top", offset: 12, fontSize: 11, fill: AXIS.text }}
        />
        {series.map((s, k) => (
          <Line
            key={s.name}
            dataKey={`s${k}`}
            name={s.name}
            type="linear"
            stroke={s.colour}
            strokeWidth={1.5}
            strokeDasharray={s.dashed ? "6 4" : undefined}
            dot={{ r: 3, fill: s.colour, stroke: "none" }}
            activeDot={false}
            isAnimationActive={false}
          >
            <LabelList
              dataKey={`s${k}`}
              content={(p) =>
                p.index === ends[k].index ? (
                  <text x={Number(p.x) + 8} y={Number(p.y) + ends[k].dy} fontSize={12} fontWeight={600} fill={AXIS.ink}>
                    {s.name}
                  </text>
                ) : null
              }
            />
          </Line>
        ))}
      </RLineChart>
    </ChartImage>
  );
}
