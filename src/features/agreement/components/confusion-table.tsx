// The confusion matrix for one criterion: rows one reader's values, columns the other's;
// the diagonal (agreement) is marked in words as well as shade.
import { ExportCsvButton } from "../../../components/ui/export-csv-button";
import { ReportSection } from "../../../components/ui/report-section";
import type { Confusion } from "../api/agreement";

export function ConfusionTable({
  confusion,
  criterionLabel,
  filename,
  controls,
}: {
  confusion: Confusion;
  criterionLabel: string;
  filename: string;
  controls: React.ReactNode;
}) {
  const { categories, counts, rowLabel, colLabel } = confusion;
  const total = counts.reduce((s, r) => s + r.reduce((a, b) => a + b, 0), 0);
  const agreeing = categories.reduce((s, _, i) => s + (counts[i]?.[i] ?? 0), 0);
  return (
    <ReportSection
      title="Confusion matrix"
      description={`${criterionLabel}: how often ${rowLabel} (rows) and ${colLabel} (columns) gave each pair of values. ${agreeing} of ${total} exams on the diagonal.`}
      actions={
        <ExportCsvButton
          what="the confusion matrix"
          filename={filename}
          header={[`${rowLabel} \\ ${colLabel}`, ...categories.map((c) => c.label)]}
          rows={() => categories.map((c, i) => [c.label, ...categories.map((_, j) => counts[i]?.[j] ?? 0)])}
        />
      }
    >
      {controls}
      {total === 0 ? (
        <p className="text-sm text-slate-600">No exam was read by both in this range.</p>
      ) : (
        <div className="overflow-x-auto rounded-lg border border-slate-200 bg-white">
          <table className="text-sm">
            <caption className="sr-only">
              Confusion matrix of {criterionLabel}: rows {rowLabel}, columns {colLabel}
            </caption>
            <thead className="border-b border-slate-200 bg-paper-200 text-xs text-slate-700">
              <tr>
                <th scope="col" className="px-3 py-2 text-left font-semibold">
                  {rowLabel} ↓ · {colLabel} →
                </th>
                {categories.map((c) => (
                  <th key={c.value} scope="col" className="px-3 py-2 text-right font-semibold">
                    {c.label}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody className="divide-y divide-slate-100">
              {categories.map((r, i) => (
                <tr key={r.value}>
                  <th scope="row" className="px-3 py-2 text-left font-semibold text-ink-900">
                    {r.label}
                  </th>
                  {categories.map((c, j) => {
                    const n = counts[i]?.[j] ?? 0;
                    const diagonal = i === j;
                    return (
                      <td
                        key={c.value}
                        className={`px-3 py-2 text-right tabular-nums ${diagonal ? "bg-sea-50 font-semibold text-sea-800" : n > 0 ? "text-coral-800" : "text-slate-500"}`}
                        title={diagonal ? "Same value" : undefined}
                      >
                        {n}
                        {diagonal ? <span className="sr-only"> (same value)</span> : null}
                      </td>
                    );
                  })}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </ReportSection>
  );
}
