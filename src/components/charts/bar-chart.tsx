// A column chart (recharts) with the count written above each column and the category
// below it. One named image for assistive technology: the table beside it carries the figures.
import { Bar, type BarShapeProps, CartesianGrid, Rectangle, BarChart as RBarChart, LabelList, XAxis, YAxis } from "recharts";
import { ChartImage } from "./chart-image";
import { AXIS, AXIS_TICK, niceMax, niceTicks } from "./scale";

/** Columns of counts, one colour; `label` names the chart for screen readers. */
export function BarChart({ bars, colour, label, height = 220 }: { bars: { label: string; value: number }[]; colour: string; label: string; height?: number }) {
  const max = niceMax(Math.max(0, ...bars.map((b) => b.value)));
  return (
    <ChartImage label={label}>
      <RBarChart
        responsive
        width="100%"
        height={height}
        data={bars}
        margin={{ top: 20, right: 10, bottom: 4, left: 0 }}
        accessibilityLayer={false}
        title={label}
        desc={bars.map((b) => `${b.label}: ${b.value}`).join("; ")}
      >
        <CartesianGrid vertical={false} stroke={AXIS.grid} />
        <XAxis dataKey="label" tick={{ ...AXIS_TICK, fontSize: 12 }} tickLine={false} axisLine={{ stroke: AXIS.line }} interval={0} />
        <YAxis domain={[0, max]} ticks={niceTicks(0, max, 4)} allowDecimals={false} tick={AXIS_TICK} tickLine={false} axisLine={false} width={40} />
        <Bar
          dataKey="value"
          fill={colour}
          radius={[2, 2, 0, 0]}
          maxBarSize={64}
          isAnimationActive={false}
          // A custom shape keeps zero-height columns, so an empty bucket still shows its "0".
          shape={(p: BarShapeProps) => <Rectangle {...p} />}
        >
          <LabelList dataKey="value" position="top" offset={5} fontSize={12} fontWeight={600} fill={AXIS.ink} />
        </Bar>
      </RBarChart>
    </ChartImage>
  );
}
