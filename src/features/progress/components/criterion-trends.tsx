// Per-criterion trends of one application: the rolling mean of attainment (0–100 %, 100 =
// the level the program aims for) over the learner's reviewed exams, oldest first, one line
// per criterion in the Okabe–Ito palette with a key that can hide lines, and the same
// figures in a table (latest rolling mean, overall mean, direction). Drawn with recharts:
// import this only from lazily loaded routes, so the chart library stays out of the entry.
import { useState } from "react";
import { ArrowDownRight, ArrowRight, ArrowUpRight } from "lucide-react";
import { CartesianGrid, Line, LineChart, XAxis, YAxis } from "recharts";
import type { ApplicationProgress, TrendSeries } from "../../../../shared/schemas/progress";
import { ChartImage } from "../../../components/charts/chart-image";
import { AXIS, AXIS_TICK, niceTicks } from "../../../components/charts/scale";
import { tableClasses as t } from "../../../components/ui/report-section";
import { EmptyState } from "../../../components/ui/states";
import { OKABE_ITO } from "../../../lib/chart-colours";
import { formatDate } from "../../../lib/format";
import { percent } from "../../../lib/stat-format";

// Okabe–Ito without its yellow, which is too light for a thin line on paper; past six
// series the colours repeat with a dashed line, so no two lines look the same.
const LINE_COLOURS = [OKABE_ITO[0], OKABE_ITO[1], OKABE_ITO[2], OKABE_ITO[4], OKABE_ITO[5], OKABE_ITO[6]];
const DASHES = [undefined, "7 4", "2 3"];

/** The colour and dash pattern of the i-th criterion. */
export function trendStyle(i: number): { colour: string; dash: string | undefined } {
  return { colour: LINE_COLOURS[i % LINE_COLOURS.length], dash: DASHES[Math.floor(i / LINE_COLOURS.length) % DASHES.length] };
}

/** Change of the rolling mean over the last `window` exams, as a direction in words. */
export function trendDirection(s: TrendSeries, window: number): { word: "Rising" | "Falling" | "Steady"; change: number } | null {
  const n = s.points.length;
  if (n < 2) return null;
  const now = s.points[n - 1].rolling;
  const before = s.points[Math.max(0, n - 1 - window)].rolling;
  const change = now - before;
  // Five percentage points either way is a change worth naming; less is noise in a handful of exams.
  return { word: change >= 0.05 ? "Rising" : change <= -0.05 ? "Falling" : "Steady", change };
}

/** The exams in order across all series (a criterion may be missing from some exams). */
function examAxis(series: TrendSeries[]): { examId: string; performedAt: string }[] {
  const seen = new Map<string, string>();
  for (const s of series) for (const p of s.points) if (!seen.has(p.examId)) seen.set(p.examId, p.performedAt);
  return [...seen.entries()].map(([examId, performedAt]) => ({ examId, performedAt })).sort((a, b) => a.performedAt.localeCompare(b.performedAt));
}

function Direction({ d }: { d: ReturnType<typeof trendDirection> }) {
  if (!d) return <span className="text-slate-600">—</span>;
  const Icon = d.word === "Rising" ? ArrowUpRight : d.word === "Falling" ? ArrowDownRight : ArrowRight;
  const points = Math.round(d.change * 100);
  return (
    <span className={`inline-flex items-center gap-1 ${d.word === "Falling" ? "font-semibold text-coral-700" : "text-ink-900"}`}>
      <Icon aria-hidden="true" className="size-4" />
      {d.word}
      <span className="tabular-nums text-slate-600">
        ({points > 0 ? "+" : points < 0 ? "−" : "±"}
        {Math.abs(points)} pts)
      </span>
    </span>
  );
}

/** Rolling-mean lines per criterion for one application, with a table of the same figures. */
export function CriterionTrends({ application, window }: { application: ApplicationProgress; window: number }) {
  const series = application.trends.filter((s) => s.points.length > 0);
  const [hidden, setHidden] = useState<ReadonlySet<string>>(new Set());
  const name = application.application.name;
  if (series.length === 0) return <EmptyState title="No reviewed exams yet">Trends appear once a reviewer has scored a {name} exam.</EmptyState>;

  const exams = examAxis(series);
  const index = new Map(exams.map((e, i) => [e.examId, i]));
  const data = exams.map((e, i) => {
    const row: Record<string, number | string | null> = { x: i + 1, performedAt: e.performedAt };
    series.forEach((s, k) => (row[`s${k}`] = null));
    return row;
  });
  series.forEach((s, k) => s.points.forEach((p) => (data[index.get(p.examId)!][`s${k}`] = Math.round(p.rolling * 1000) / 10)));
  const lastX = Math.max(2, exams.length);
  const toggle = (key: string) =>
    setHidden((prev) => {
      const next = new Set(prev);
      if (next.has(key)) next.delete(key);
      else next.add(key);
      return next;
    });
  const latest = (s: TrendSeries) => s.points[s.points.length - 1].rolling;
  const overall = (s: TrendSeries) => s.points.reduce((sum, p) => sum + p.value, 0) / s.points.length;

  return (
    <div className="space-y-3">
      <figure className="rounded-lg border border-slate-200 bg-white p-3">
        <ChartImage
          label={`Criterion trends for ${name}: rolling mean over the last ${window} exams, in percent of the level aimed for, across ${exams.length} reviewed exams. ${series
            .map((s) => `${s.label} now ${percent(latest(s))}`)
            .join("; ")}.`}
        >
          <LineChart
            responsive
            width="100%"
            height={260}
            data={data}
            margin={{ top: 12, right: 20, bottom: 18, left: 0 }}
            accessibilityLayer={false}
            title={`Criterion trends for ${name}`}
          >
            <CartesianGrid stroke={AXIS.grid} vertical={false} />
            <XAxis
              type="number"
              dataKey="x"
              domain={[1, lastX]}
              allowDecimals={false}
              ticks={niceTicks(1, lastX, 8).filter((v) => Number.isInteger(v) && v >= 1)}
              tick={AXIS_TICK}
              tickLine={false}
              axisLine={{ stroke: AXIS.line }}
              label={{ value: "Reviewed exams, oldest first", position: "insideBottom", offset: -12, fontSize: 11, fill: AXIS.text }}
            />
            <YAxis
              domain={[0, 100]}
              ticks={[0, 25, 50, 75, 100]}
              tickFormatter={(v: number) => `${v}%`}
              tick={AXIS_TICK}
              tickLine={false}
              axisLine={false}
              width={44}
            />
            {series.map((s, k) =>
              hidden.has(s.criterionKey) ? null : (
                <Line
                  key={s.criterionKey}
                  dataKey={`s${k}`}
                  name={s.label}
                  type="linear"
                  stroke={trendStyle(k).colour}
                  strokeDasharray={trendStyle(k).dash}
                  strokeWidth={2}
                  dot={exams.length <= 30 ? { r: 2.5, fill: trendStyle(k).colour, stroke: "none" } : false}
                  activeDot={false}
                  connectNulls
                  isAnimationActive={false}
                />
              ),
            )}
          </LineChart>
        </ChartImage>
        <figcaption className="mt-2">
          <p className="mb-1 text-xs text-slate-600">Key — select a criterion to hide or show its line:</p>
          <ul className="flex flex-wrap gap-2">
            {series.map((s, k) => {
              const shown = !hidden.has(s.criterionKey);
              return (
                <li key={s.criterionKey}>
                  <button
                    type="button"
                    aria-pressed={shown}
                    onClick={() => toggle(s.criterionKey)}
                    className={`inline-flex items-center gap-1.5 rounded-md border px-2 py-0.5 text-xs focus-visible:outline-2 focus-visible:outline-sea-600 ${
                      shown ? "border-slate-300 bg-white text-ink-900" : "border-dashed border-slate-300 bg-paper-200 text-slate-600 line-through"
                    }`}
                  >
                    <svg aria-hidden="true" width="22" height="8" viewBox="0 0 22 8">
                      <line x1="1" y1="4" x2="21" y2="4" stroke={trendStyle(k).colour} strokeWidth="2.5" strokeDasharray={trendStyle(k).dash} />
                    </svg>
                    {s.label}
                  </button>
                </li>
              );
            })}
          </ul>
        </figcaption>
      </figure>

      <div className={t.wrap}>
        <table className={t.table}>
          <caption className="sr-only">
            Criterion trends for {name}: the rolling mean over the last {window} exams, the mean over all reviewed exams, and the direction
          </caption>
          <thead className={t.thead}>
            <tr>
              <th scope="col" className={t.th}>
                Criterion
              </th>
              <th scope="col" className={t.thNum}>
                Exams
              </th>
              <th scope="col" className={t.thNum}>
                Last {window} exams
              </th>
              <th scope="col" className={t.thNum}>
                All exams
              </th>
              <th scope="col" className={t.th}>
                Direction
              </th>
            </tr>
          </thead>
          <tbody className={t.tbody}>
            {series.map((s) => (
              <tr key={s.criterionKey}>
                <th scope="row" className="px-3 py-2 font-semibold text-ink-900">
                  {s.label}
                </th>
                <td className={t.tdNum}>{s.points.length}</td>
                <td className={t.tdNum}>{percent(latest(s))}</td>
                <td className={t.tdNum}>{percent(overall(s))}</td>
                <td className={t.td}>
                  <Direction d={trendDirection(s, window)} />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <details className="rounded-lg border border-slate-200 bg-white">
        <summary className="cursor-pointer px-3 py-2 text-sm font-semibold text-sea-700">Show the rolling mean after every exam</summary>
        <div className="max-h-96 overflow-auto border-t border-slate-200">
          <table className={t.table}>
            <caption className="sr-only">Rolling mean per criterion after each reviewed {name} exam</caption>
            <thead className={t.thead}>
              <tr>
                <th scope="col" className={t.thNum}>
                  Exam
                </th>
                <th scope="col" className={t.th}>
                  Performed
                </th>
                {series.map((s) => (
                  <th key={s.criterionKey} scope="col" className={t.thNum}>
                    {s.label}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody className={t.tbody}>
              {data.map((row, i) => (
                <tr key={exams[i].examId}>
                  <td className={t.tdNum}>{i + 1}</td>
                  <td className={`${t.td} whitespace-nowrap tabular-nums`}>{formatDate(exams[i].performedAt)}</td>
                  {series.map((s, k) => (
                    <td key={s.criterionKey} className={t.tdNum}>
                      {row[`s${k}`] === null ? "—" : `${Math.round(Number(row[`s${k}`]))}%`}
                    </td>
                  ))}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </details>
      <p className="text-xs text-slate-600">
        Attainment is how close a score is to the level the program aims for: 100% at that level, 0% at the furthest one. Each point is the mean over the last{" "}
        {window} exams scored on that criterion (fewer at the start).
      </p>
    </div>
  );
}
