// Each reviewer's bias against consensus on one criterion: the mean difference (reviewer
// minus consensus) as a dot with its 95 % interval as a whisker, a zero line, and the
// reviewer's name and value written on the chart. The table beside it is the text form.
// Drawn with recharts; this route is lazy-loaded, so the chart library stays out of the entry chunk.
import { DotWhiskerChart, type DotWhiskerRow } from "../../../components/charts/dot-whisker-chart";
import { ExportCsvButton } from "../../../components/ui/export-csv-button";
import { ReportSection, tableClasses as t } from "../../../components/ui/report-section";
import { seriesColour } from "../../../lib/chart-colours";
import type { ReviewerBias } from "../api/agreement";
import { formatCoefficient, formatInterval } from "../../../lib/stat-format";

export function BiasChart({ bias, criterionLabel, filename }: { bias: ReviewerBias[]; criterionLabel: string; filename: string }) {
  const rows: DotWhiskerRow[] = bias
    .filter((b) => b.meanDifference !== null)
    .map((b, i) => ({
      id: b.reviewer.id,
      label: b.reviewer.name,
      value: b.meanDifference!,
      interval: b.ci95,
      colour: seriesColour(i),
      text: formatCoefficient(b.meanDifference!),
    }));

  return (
    <ReportSection
      title="Bias against consensus"
      description={`Mean of (reviewer − consensus) on ${criterionLabel} in level steps, with its 95 % interval. Left of zero: scores lower than consensus; right: higher.`}
      actions={
        <ExportCsvButton
          what="bias against consensus"
          filename={filename}
          header={["reviewer", "n", "mean_difference", "ci_low", "ci_high"]}
          rows={() => bias.map((b) => [b.reviewer.name, b.n, b.meanDifference, b.ci95?.[0], b.ci95?.[1]])}
        />
      }
    >
      <div className="grid gap-4 lg:grid-cols-[3fr_2fr]">
        <figure className="rounded-lg border border-slate-200 bg-white p-3">
          {rows.length === 0 ? (
            <p className="p-4 text-sm text-slate-600">No reviewer has a computable bias on this criterion yet.</p>
          ) : (
            <DotWhiskerChart
              rows={rows}
              referenceLabel="consensus"
              formatTick={formatCoefficient}
              label={`Bias against consensus on ${criterionLabel}, per reviewer, with 95 % intervals`}
            />
          )}
          <figcaption className="mt-1 text-xs text-slate-600">Dots: mean difference; whiskers: 95 % interval; the line marks no bias.</figcaption>
        </figure>
        <div className={t.wrap}>
          <table className={t.table}>
            <caption className="sr-only">Bias of each reviewer against consensus on {criterionLabel}</caption>
            <thead className={t.thead}>
              <tr>
                <th scope="col" className={t.th}>
                  Reviewer
                </th>
                <th scope="col" className={t.thNum}>
                  n
                </th>
                <th scope="col" className={t.thNum}>
                  Mean difference
                </th>
                <th scope="col" className={t.thNum}>
                  95 % interval
                </th>
              </tr>
            </thead>
            <tbody className={t.tbody}>
              {bias.map((b) => (
                <tr key={b.reviewer.id}>
                  <th scope="row" className="px-3 py-2 font-semibold text-ink-900">
                    {b.reviewer.name}
                  </th>
                  <td className={t.tdNum}>{b.n}</td>
                  <td className={t.tdNum}>
                    {b.meanDifference === null ? (
                      <span title="Not computable: too few reads or a criterion without an order">—</span>
                    ) : (
                      formatCoefficient(b.meanDifference)
                    )}
                  </td>
                  <td className={t.tdNum}>{b.ci95 ? formatInterval(b.ci95) : <span title="No interval: fewer than two reads">—</span>}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </div>
    </ReportSection>
  );
}
