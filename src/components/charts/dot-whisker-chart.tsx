// A dot-and-whisker chart (recharts): one row per item, the dot at its value, the whisker
// across its interval, a reference line at zero, and the item's name and value written on
// the chart (no legend to decode). One named image for assistive technology: the table
// beside it carries the same figures.
import { CartesianGrid, Cell, ErrorBar, LabelList, ReferenceLine, Scatter, ScatterChart, XAxis, YAxis } from "recharts";
import { ChartImage } from "./chart-image";
import { AXIS, AXIS_TICK, niceTicks } from "./scale";

export interface DotWhiskerRow {
  id: string;
  label: string;
  value: number;
  interval: [number, number] | null;
  colour: string;
  /** The value as written on the chart. */
  text: string;
}

const WHISKER = "#324d66";

/** Dots with 95 % whiskers around a zero line; `label` names the chart for screen readers. */
export function DotWhiskerChart({
  rows,
  referenceLabel,
  formatTick,
  label,
}: {
  rows: DotWhiskerRow[];
  referenceLabel: string;
  formatTick: (v: number) => string;
  label: string;
}) {
  const reach = Math.max(0.5, ...rows.flatMap((r) => (r.interval ? r.interval.map(Math.abs) : [Math.abs(r.value)])));
  const lim = Math.ceil(reach * 4) / 4;
  // Rows sit at y = 0, 1, 2 … (top to bottom); the whisker is the interval as distances
  // below and above the value, which is what ErrorBar draws.
  const data = rows.map((r, i) => ({
    ...r,
    y: i,
    whisker: r.interval ? [r.value - r.interval[0], r.interval[1] - r.value] : [0, 0],
  }));
  return (
    <ChartImage label={label}>
      <ScatterChart
        responsive
        width="100%"
        height={26 + rows.length * 40 + 28}
        margin={{ top: 26, right: 30, bottom: 4, left: 10 }}
        accessibilityLayer={false}
        title={label}
        desc={rows.map((r) => `${r.label}: ${r.text}`).join("; ")}
      >
        <CartesianGrid horizontal={false} stroke={AXIS.grid} />
        <XAxis
          type="number"
          dataKey="value"
          domain={[-lim, lim]}
          ticks={niceTicks(-lim, lim, 6)}
          tickFormatter={formatTick}
          allowDataOverflow
          tick={AXIS_TICK}
          tickLine={false}
          axisLine={false}
        />
        <YAxis
          type="number"
          dataKey="y"
          domain={[-0.5, rows.length - 0.5]}
          ticks={rows.map((_, i) => i)}
          tickFormatter={(i: number) => rows[i]?.label ?? ""}
          reversed
          interval={0}
          tick={{ fontSize: 12, fill: AXIS.ink }}
          tickLine={false}
          axisLine={false}
          width={140}
        />
        <ReferenceLine x={0} stroke={AXIS.ink} strokeWidth={1.5} label={{ value: referenceLabel, position: "top", fontSize: 11, fill: AXIS.text }} />
        <Scatter data={data} isAnimationActive={false} shape="circle" stroke={AXIS.ink} strokeWidth={1}>
          {data.map((r) => (
            <Cell key={r.id} fill={r.colour} />
          ))}
          <ErrorBar dataKey="whisker" direction="x" width={5} stroke={WHISKER} strokeWidth={1.5} />
          <LabelList dataKey="text" position="top" offset={9} fontSize={12} fill={AXIS.ink} />
        </Scatter>
      </ScatterChart>
    </ChartImage>
  );
}
