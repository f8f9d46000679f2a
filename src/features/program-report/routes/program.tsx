// Oversight → Program: how the review service keeps up — backlog by age, weekly
// throughput and turnaround, volume per application, and reviewer workload. Each chart
// has its numbers in a table beside it (the text alternative) and every table exports CSV.
import { useQuery } from "@tanstack/react-query";
import { BarChart } from "../../../components/charts/bar-chart";
import { LineChart } from "../../../components/charts/line-chart";
import { StackedBarChart } from "../../../components/charts/stacked-bar-chart";
import { ExportCsvButton } from "../../../components/ui/export-csv-button";
import { PageHeader } from "../../../components/ui/page-header";
import { ReportSection, tableClasses as t } from "../../../components/ui/report-section";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { TextField } from "../../../components/ui/text-field";
import { OKABE_ITO, seriesColour } from "../../../lib/chart-colours";
import { daysAgo, isIsoDay, isoDay } from "../../../lib/date-range";
import { formatDate } from "../../../lib/format";
import { programQuery, type ProgramReport } from "../api/program";
import { WorkloadTable } from "../components/workload-table";
import { FollowUpReport } from "../components/follow-up-report";
import { useSearchState } from "../../../lib/use-search-state";

const hours = (h: number | null) => (h === null ? "—" : h < 10 ? h.toFixed(1) : String(Math.round(h)));
const weekLabel = (w: string) => formatDate(`${w}T00:00:00`);
const shortWeek = (w: string) => new Intl.DateTimeFormat(undefined, { day: "numeric", month: "short" }).format(new Date(`${w}T00:00:00`));

function Frame({ chart, table }: { chart: React.ReactNode; table: React.ReactNode }) {
  return (
    <div className="grid gap-4 lg:grid-cols-[3fr_2fr]">
      <figure className="rounded-lg border border-slate-200 bg-white p-3">{chart}</figure>
      <div className={`${t.wrap} max-h-96 overflow-y-auto`}>{table}</div>
    </div>
  );
}

function Report({ data, stem }: { data: ProgramReport; stem: string }) {
  const weeks = [...new Set([...data.weekly.map((w) => w.week), ...data.volume.map((v) => v.week)])].sort();
  const apps = [...new Set(data.volume.map((v) => v.application))].sort();
  const volumeOf = (week: string, app: string) => data.volume.find((v) => v.week === week && v.application === app)?.count ?? 0;
  const backlogTotal = data.backlog.reduce((s, b) => s + b.count, 0);
  return (
    <>
      <ReportSection
        title="Backlog by age"
        description={`${backlogTotal} submitted exams wait for a read, by time since submission.`}
        actions={
          <ExportCsvButton
            what="backlog by age"
            filename={`${stem}_backlog.csv`}
            header={["age", "exams"]}
            rows={() => data.backlog.map((b) => [b.bucket, b.count])}
          />
        }
      >
        <Frame
          chart={
            <BarChart
              bars={data.backlog.map((b) => ({ label: b.bucket, value: b.count }))}
              colour={OKABE_ITO[4]}
              label={`Exams waiting for a read, by age: ${backlogTotal} in all`}
            />
          }
          table={
            <table className={t.table}>
              <caption className="sr-only">Exams waiting for a read, by age</caption>
              <thead className={t.thead}>
                <tr>
                  <th scope="col" className={t.th}>
                    Waiting
                  </th>
                  <th scope="col" className={t.thNum}>
                    Exams
                  </th>
                </tr>
              </thead>
              <tbody className={t.tbody}>
                {data.backlog.map((b) => (
                  <tr key={b.bucket}>
                    <th scope="row" className="px-3 py-2 font-semibold text-ink-900">
                      {b.bucket}
                    </th>
                    <td className={`${t.tdNum} ${b.bucket === "over 7 days" && b.count > 0 ? "font-semibold text-coral-700" : ""}`}>
                      {b.count}
                      {b.bucket === "over 7 days" && b.count > 0 ? <span className="sr-only"> (overdue)</span> : null}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          }
        />
      </ReportSection>

      <ReportSection
        title="Throughput and turnaround per week"
        description="Exams submitted and reviewed per week (weeks start on Monday), and hours from submission to final result: median and 90th percentile."
        actions={
          <ExportCsvButton
            what="throughput and turnaround per week"
            filename={`${stem}_weekly.csv`}
            header={["week", "submitted", "reviewed", "turnaround_median_hours", "turnaround_p90_hours"]}
            rows={() => data.weekly.map((w) => [w.week, w.submitted, w.reviewed, w.turnaroundMedianHours, w.turnaroundP90Hours])}
          />
        }
      >
        <Frame
          chart={
            data.weekly.length === 0 ? (
              <p className="p-4 text-sm text-slate-600">No week in this range has activity.</p>
            ) : (
              <LineChart
                categories={data.weekly.map((w) => w.week)}
                formatCategory={shortWeek}
                unit="hours"
                label="Turnaround per week in hours: median and 90th percentile"
                series={[
                  { name: "Median", colour: OKABE_ITO[4], values: data.weekly.map((w) => w.turnaroundMedianHours) },
                  { name: "90th percentile", colour: OKABE_ITO[5], dashed: true, values: data.weekly.map((w) => w.turnaroundP90Hours) },
                ]}
              />
            )
          }
          table={
            <table className={t.table}>
              <caption className="sr-only">Exams submitted and reviewed, and turnaround in hours, per week</caption>
              <thead className={t.thead}>
                <tr>
                  <th scope="col" className={t.th}>
                    Week of
                  </th>
                  <th scope="col" className={t.thNum}>
                    Submitted
                  </th>
                  <th scope="col" className={t.thNum}>
                    Reviewed
                  </th>
                  <th scope="col" className={t.thNum}>
                    Median h
                  </th>
                  <th scope="col" className={t.thNum}>
                    90th pct h
                  </th>
                </tr>
              </thead>
              <tbody className={t.tbody}>
                {data.weekly.map((w) => (
                  <tr key={w.week}>
                    <th scope="row" className="whitespace-nowrap px-3 py-2 font-semibold tabular-nums text-ink-900">
                      {weekLabel(w.week)}
                    </th>
                    <td className={t.tdNum}>{w.submitted}</td>
                    <td className={t.tdNum}>{w.reviewed}</td>
                    <td className={t.tdNum}>{hours(w.turnaroundMedianHours)}</td>
                    <td className={t.tdNum}>{hours(w.turnaroundP90Hours)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          }
        />
      </ReportSection>

      <ReportSection
        title="Volume per application"
        description="Exams submitted per week, stacked by application; the total is written above each week."
        actions={
          <ExportCsvButton
            what="volume per application"
            filename={`${stem}_volume.csv`}
            header={["week", "application", "exams"]}
            rows={() => data.volume.map((v) => [v.week, v.application, v.count])}
          />
        }
      >
        <Frame
          chart={
            weeks.length === 0 ? (
              <p className="p-4 text-sm text-slate-600">No exams submitted in this range.</p>
            ) : (
              <StackedBarChart
                categories={weeks}
                formatCategory={shortWeek}
                label="Exams submitted per week, stacked by application"
                series={apps.map((a, i) => ({ name: a, colour: seriesColour(i), values: weeks.map((w) => volumeOf(w, a)) }))}
              />
            )
          }
          table={
            <table className={t.table}>
              <caption className="sr-only">Exams submitted per week and application</caption>
              <thead className={t.thead}>
                <tr>
                  <th scope="col" className={t.th}>
                    Week of
                  </th>
                  {apps.map((a) => (
                    <th key={a} scope="col" className={t.thNum}>
                      {a}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody className={t.tbody}>
                {weeks.map((w) => (
                  <tr key={w}>
                    <th scope="row" className="whitespace-nowrap px-3 py-2 font-semibold tabular-nums text-ink-900">
                      {weekLabel(w)}
                    </th>
                    {apps.map((a) => (
                      <td key={a} className={t.tdNum}>
                        {volumeOf(w, a)}
                      </td>
                    ))}
                  </tr>
                ))}
              </tbody>
            </table>
          }
        />
      </ReportSection>

      <WorkloadTable reviewers={data.reviewers} filename={`${stem}_reviewers.csv`} />

      <FollowUpReport report={data.followUps} filename={`${stem}_follow-ups.csv`} />
    </>
  );
}

export default function ProgramPage() {
  const [params, update] = useSearchState();
  const from = isIsoDay(params.get("from")) ? params.get("from")! : daysAgo(84);
  const to = isIsoDay(params.get("to")) ? params.get("to")! : isoDay(new Date());
  const report = useQuery(programQuery({ from, to }));
  const set = (k: "from" | "to", v: string) => isIsoDay(v) && update({ from, to, [k]: v });
  const data = report.data;
  const empty =
    data &&
    data.followUps.open === 0 &&
    data.followUps.byOutcome.length === 0 &&
    data.weekly.every((w) => w.submitted === 0 && w.reviewed === 0) &&
    data.volume.length === 0 &&
    data.backlog.every((b) => b.count === 0);

  return (
    <div>
      <PageHeader
        eyebrow="Oversight"
        title="Program"
        description="How the review service keeps up: what waits, how fast exams come back, what arrives, and who reads it."
      />
      <form
        role="search"
        aria-label="Choose the report range"
        onSubmit={(e) => e.preventDefault()}
        className="mb-6 flex flex-wrap items-end gap-3 rounded-lg border border-slate-200 bg-white p-4"
      >
        <TextField label="From" type="date" className="w-40" value={from} max={to} onChange={(e) => set("from", e.target.value)} />
        <TextField label="To" type="date" className="w-40" value={to} min={from} onChange={(e) => set("to", e.target.value)} />
        {report.isFetching && data ? (
          <span role="status" className="pb-2 text-sm text-slate-600">
            Updating…
          </span>
        ) : null}
      </form>
      {from > to ? (
        <ErrorState title="Check the dates" error={new Error("The start of the range is after its end.")} />
      ) : report.isError ? (
        <ErrorState error={report.error} onRetry={() => void report.refetch()} retrying={report.isFetching} />
      ) : !data ? (
        <LoadingState label="Loading the program report…" />
      ) : empty ? (
        <EmptyState title="Nothing submitted or reviewed in this range yet">Widen the dates to see earlier weeks.</EmptyState>
      ) : (
        <Report data={data} stem={`program_${from}_${to}`} />
      )}
    </div>
  );
}
