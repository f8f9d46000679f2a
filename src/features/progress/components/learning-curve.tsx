// The CUSUM learning curve of one application: the path over reviewed exams in the order
// performed (a step up for an exam without credit, a step down for a credited one), the two
// decision limits as labelled lines, the first signal marked, and the result in one plain
// sentence with the settings in plain words. Drawn with recharts: import this only from
// lazily loaded routes, so the chart library stays out of the entry chunk.
import { CartesianGrid, ComposedChart, Line, ReferenceDot, ReferenceLine, XAxis, YAxis } from "recharts";
import type { ApplicationProgress, CusumView } from "../../../../shared/schemas/progress";
import { ChartImage } from "../../../components/charts/chart-image";
import { AXIS, AXIS_TICK, niceTicks } from "../../../components/charts/scale";
import { tableClasses as t } from "../../../components/ui/report-section";
import { EmptyState } from "../../../components/ui/states";
import { formatDate } from "../../../lib/format";
import { signed } from "../../../lib/stat-format";
import { FAILURE_MEANING, cusumParameters, cusumSentence, type ProgressViewer } from "./cusum-words";

const PATH = "#0072B2"; // Okabe–Ito blue
const UPPER = "#D55E00"; // Okabe–Ito vermillion: the unacceptable limit
const LOWER = "#009E73"; // Okabe–Ito bluish green: the acceptable-rate limit

type Datum = { n: number; value: number; failed: boolean | null };

/** One attempt's mark: a small circle for a credited exam, a triangle pointing up for one without credit. */
function AttemptDot(props: { cx?: number; cy?: number; payload?: Datum; index?: number }) {
  const { cx, cy, payload, index } = props;
  if (cx === undefined || cy === undefined || !payload || payload.failed === null) return <g key={`d${index}`} />;
  return payload.failed ? (
    <path key={`d${index}`} d={`M${cx},${cy - 5} L${cx + 4.5},${cy + 3.5} L${cx - 4.5},${cy + 3.5} Z`} fill={UPPER} stroke="#ffffff" strokeWidth={0.75} />
  ) : (
    <circle key={`d${index}`} cx={cx} cy={cy} r={2.5} fill={PATH} />
  );
}

function signalValue(c: CusumView): number | null {
  if (c.signalAtAttempt === null) return null;
  return c.points.find((p) => p.n === c.signalAtAttempt)?.value ?? null;
}

/** The CUSUM chart of one application with its sentence, settings and a table of the points. */
export function LearningCurve({ application, viewer = "learner" }: { application: ApplicationProgress; viewer?: ProgressViewer }) {
  const c = application.cusum;
  const name = application.application.name;
  const sentence = cusumSentence(c, viewer);
  const data: Datum[] = [{ n: 0, value: 0, failed: null }, ...c.points.map((p) => ({ n: p.n, value: p.value, failed: p.failed }))];
  const values = data.map((d) => d.value);
  const lo = Math.floor(Math.min(c.h0, ...values) - 0.5);
  const hi = Math.ceil(Math.max(c.h1, ...values) + 0.5);
  const lastN = Math.max(5, c.points.length);
  const sigValue = signalValue(c);
  const failures = c.points.filter((p) => p.failed).length;

  return (
    <div className="space-y-3">
      <p className="text-base font-semibold text-ink-950" data-testid="cusum-sentence">
        {sentence}.
      </p>
      {c.points.length === 0 ? (
        <EmptyState title="No reviewed exams yet">The learning curve starts with the first reviewed {name} exam.</EmptyState>
      ) : (
        <figure className="rounded-lg border border-slate-200 bg-white p-3">
          <ChartImage
            label={`Learning curve for ${name}: ${c.points.length} reviewed exams, ${failures} without credit. ${sentence}. Acceptable-rate limit ${signed(c.h0)}, unacceptable limit ${signed(c.h1)}.`}
          >
            <ComposedChart
              responsive
              width="100%"
              height={280}
              data={data}
              margin={{ top: 16, right: 24, bottom: 18, left: 0 }}
              accessibilityLayer={false}
              title={`Learning curve for ${name}`}
              desc={sentence}
            >
              <CartesianGrid stroke={AXIS.grid} />
              <XAxis
                type="number"
                dataKey="n"
                domain={[0, lastN]}
                allowDecimals={false}
                ticks={niceTicks(0, lastN, 8).filter((v) => Number.isInteger(v))}
                tick={AXIS_TICK}
                tickLine={false}
                axisLine={{ stroke: AXIS.line }}
                label={{ value: "Reviewed exams in the order performed (attempt)", position: "insideBottom", offset: -12, fontSize: 11, fill: AXIS.text }}
              />
              <YAxis
                type="number"
                domain={[lo, hi]}
                ticks={niceTicks(lo, hi, 6)}
                tickFormatter={(v: number) => signed(v, Number.isInteger(v) ? 0 : 1)}
                allowDataOverflow
                tick={AXIS_TICK}
                tickLine={false}
                axisLine={false}
                width={40}
              />
              <ReferenceLine y={0} stroke={AXIS.line} />
              <ReferenceLine
                y={c.h1}
                stroke={UPPER}
                strokeWidth={1.5}
                strokeDasharray="6 4"
                label={{ value: `Unacceptable limit h1 = ${signed(c.h1)}`, position: "insideTopLeft", fontSize: 11, fill: AXIS.ink }}
              />
              <ReferenceLine
                y={c.h0}
                stroke={LOWER}
                strokeWidth={1.5}
                strokeDasharray="2 3"
                label={{ value: `Acceptable-rate limit h0 = ${signed(c.h0)}`, position: "insideBottomLeft", fontSize: 11, fill: AXIS.ink }}
              />
              <Line dataKey="value" type="stepAfter" stroke={PATH} strokeWidth={1.75} dot={AttemptDot} activeDot={false} isAnimationActive={false} />
              {c.signalAtAttempt !== null && sigValue !== null ? (
                <ReferenceDot
                  x={c.signalAtAttempt}
                  y={sigValue}
                  r={8}
                  fill="none"
                  stroke={AXIS.ink}
                  strokeWidth={2}
                  label={{
                    value: `Signal at ${c.signalAtAttempt}`,
                    position: c.signal === "competent" ? "bottom" : "top",
                    offset: 12,
                    fontSize: 11,
                    fontWeight: 600,
                    fill: AXIS.ink,
                  }}
                />
              ) : null}
            </ComposedChart>
          </ChartImage>
          <figcaption className="mt-2 flex flex-wrap gap-x-5 gap-y-1 text-xs text-slate-700">
            <span className="inline-flex items-center gap-1.5">
              <svg aria-hidden="true" width="10" height="10" viewBox="0 0 10 10">
                <circle cx="5" cy="5" r="3" fill={PATH} />
              </svg>
              Credited exam: the line steps down by {c.s.toFixed(3)}
            </span>
            <span className="inline-flex items-center gap-1.5">
              <svg aria-hidden="true" width="10" height="10" viewBox="0 0 10 10">
                <path d="M5,0 L10,9 L0,9 Z" fill={UPPER} />
              </svg>
              Exam without credit: the line steps up by {(1 - c.s).toFixed(3)}
            </span>
            <span>
              Crossing the lower limit signals the acceptable failure rate reached (a statistical signal, not a certification); crossing the upper limit signals
              an unacceptable failure rate.
            </span>
          </figcaption>
        </figure>
      )}
      <p className="text-sm text-slate-700">{FAILURE_MEANING}</p>
      <dl className="grid gap-x-4 gap-y-1 text-sm sm:grid-cols-[minmax(0,1fr)_auto]">
        {cusumParameters(c).map((p) => (
          <div key={p.key} className="contents">
            <dt className="text-slate-700">{p.words}</dt>
            <dd className="text-right font-semibold tabular-nums text-ink-950">{p.value}</dd>
          </div>
        ))}
      </dl>
      {c.points.length > 0 ? (
        <details className="rounded-lg border border-slate-200 bg-white">
          <summary className="cursor-pointer px-3 py-2 text-sm font-semibold text-sea-700">Show the learning curve as a table</summary>
          <div className="max-h-80 overflow-y-auto border-t border-slate-200">
            <table className={t.table}>
              <caption className="sr-only">Learning curve for {name}, one row per reviewed exam</caption>
              <thead className={t.thead}>
                <tr>
                  <th scope="col" className={t.thNum}>
                    Attempt
                  </th>
                  <th scope="col" className={t.th}>
                    Performed
                  </th>
                  <th scope="col" className={t.th}>
                    Outcome
                  </th>
                  <th scope="col" className={t.thNum}>
                    CUSUM
                  </th>
                </tr>
              </thead>
              <tbody className={t.tbody}>
                {c.points.map((p) => (
                  <tr key={p.examId}>
                    <td className={t.tdNum}>{p.n}</td>
                    <td className={`${t.td} tabular-nums`}>{formatDate(p.performedAt)}</td>
                    <td className={t.td}>
                      {p.failed ? "No credit (failure)" : "Credited"}
                      {p.n === c.signalAtAttempt ? <strong className="ml-2">· signal</strong> : null}
                    </td>
                    <td className={t.tdNum}>{signed(p.value)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </details>
      ) : null}
    </div>
  );
}
