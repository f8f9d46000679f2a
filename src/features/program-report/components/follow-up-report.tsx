// The follow-up report of the Program screen: follow-ups closed in the range by outcome (a bar
// chart with its table), the median and 90th-percentile time from opening to closing, how
// many closed after they were due, and those open now (urgent, overdue). Exports CSV.
import { BarChart } from "../../../components/charts/bar-chart";
import { ExportCsvButton } from "../../../components/ui/export-csv-button";
import { ReportSection, tableClasses as t } from "../../../components/ui/report-section";
import { OKABE_ITO } from "../../../lib/chart-colours";
import { FOLLOW_UP_OUTCOMES, OUTCOME_LABELS, type FollowUpOutcome } from "../../../../shared/schemas/follow-ups";
import type { ProgramReport } from "../api/program";

const labelOf = (o: string) => (o in OUTCOME_LABELS ? OUTCOME_LABELS[o as FollowUpOutcome] : "Closed without an outcome (before outcomes were recorded)");
const hours = (h: number | null) => (h === null ? "—" : h < 10 ? h.toFixed(1) : String(Math.round(h)));

export function FollowUpReport({ report, filename }: { report: ProgramReport["followUps"]; filename: string }) {
  const rows = [
    ...FOLLOW_UP_OUTCOMES.map((o) => ({ outcome: o as string, count: report.byOutcome.find((b) => b.outcome === o)?.count ?? 0 })),
    ...report.byOutcome.filter((b) => !(FOLLOW_UP_OUTCOMES as readonly string[]).includes(b.outcome)),
  ];
  const closed = rows.reduce((s, r) => s + r.count, 0);
  const summary: [string, string | number][] = [
    ["Closed in the range", closed],
    ["Median time to close (hours)", hours(report.medianHoursToClose)],
    ["90th percentile time to close (hours)", hours(report.p90HoursToClose)],
    ["Closed after they were due", report.closedLate],
    ["Urgent ones closed", report.urgentClosed],
    ["Open now", report.open],
    ["Open and overdue now", report.openOverdue],
    ["Open and urgent now", report.openUrgent],
  ];
  return (
    <ReportSection
      title="Follow-ups"
      description="Patient follow-ups closed in this range by outcome, how long they took, and those still open."
      actions={
        <ExportCsvButton
          what="follow-ups"
          filename={filename}
          header={["measure", "value"]}
          rows={() => [...rows.map((r) => [`closed: ${labelOf(r.outcome)}`, r.count] as const), ...summary]}
        />
      }
    >
      <div className="grid gap-4 lg:grid-cols-[3fr_2fr]">
        <figure className="rounded-lg border border-slate-200 bg-white p-3">
          {closed === 0 ? (
            <p className="p-6 text-center text-sm text-slate-600">No follow-up was closed in this range.</p>
          ) : (
            <BarChart
              bars={rows.map((r) => ({ label: labelOf(r.outcome), value: r.count }))}
              colour={OKABE_ITO[5]}
              label={`Follow-ups closed by outcome: ${closed} in all`}
            />
          )}
        </figure>
        <div className={t.wrap}>
          <table className={t.table}>
            <caption className="sr-only">Follow-up figures</caption>
            <tbody className={t.tbody}>
              {rows.map((r) => (
                <tr key={r.outcome}>
                  <th scope="row" className="px-3 py-2 font-normal text-ink-900">
                    {labelOf(r.outcome)}
                  </th>
                  <td className={t.tdNum}>{r.count}</td>
                </tr>
              ))}
              {summary.map(([label, value]) => (
                <tr key={label}>
                  <th scope="row" className="px-3 py-2 font-semibold text-ink-900">
                    {label}
                  </th>
                  <td className={`${t.tdNum} ${label === "Open and overdue now" && Number(value) > 0 ? "font-semibold text-coral-700" : ""}`}>{value}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </div>
    </ReportSection>
  );
}
