// The reviewer-pair matrix for one criterion: reviewers on both axes, each cell the pair's
// percent agreement or kappa with n, on a single-hue sequential scale with the number
// printed, so the figure never rests on colour.
import { ExportCsvButton } from "../../../components/ui/export-csv-button";
import { ReportSection } from "../../../components/ui/report-section";
import { sequentialColour } from "../../../lib/chart-colours";
import type { PairAgreement, Person } from "../api/agreement";
import { formatCoefficient, formatPercent } from "../../../lib/stat-format";

export type PairMeasure = "percentAgreement" | "kappa";

export function PairHeatmap({
  pairs,
  measure,
  onMeasureChange,
  criterionLabel,
  filename,
}: {
  pairs: PairAgreement[];
  measure: PairMeasure;
  onMeasureChange: (m: PairMeasure) => void;
  criterionLabel: string;
  filename: string;
}) {
  const people = new Map<string, Person>();
  for (const p of pairs) {
    people.set(p.a.id, p.a);
    people.set(p.b.id, p.b);
  }
  const reviewers = [...people.values()].sort((x, y) => x.name.localeCompare(y.name));
  const byPair = new Map<string, PairAgreement>();
  for (const p of pairs) {
    byPair.set(`${p.a.id}|${p.b.id}`, p);
    byPair.set(`${p.b.id}|${p.a.id}`, p);
  }
  const word = measure === "kappa" ? "Cohen's kappa" : "percent agreement";

  return (
    <ReportSection
      title="Reviewer pairs"
      description={`${word[0].toUpperCase()}${word.slice(1)} of each pair of reviewers on ${criterionLabel}, over the exams both read; n is that number of exams. Darker means closer agreement.`}
      actions={
        <ExportCsvButton
          what="reviewer pairs"
          filename={filename}
          header={["reviewer_a", "reviewer_b", "units", "percent_agreement", "kappa"]}
          rows={() => pairs.map((p) => [p.a.name, p.b.name, p.units, p.percentAgreement, p.kappa])}
        />
      }
    >
      <fieldset className="mb-3 flex flex-wrap items-center gap-4 text-sm">
        <legend className="sr-only">Measure shown in the pair matrix</legend>
        {(["percentAgreement", "kappa"] as const).map((m) => (
          <label key={m} className="inline-flex items-center gap-1.5 text-ink-900">
            <input type="radio" name="pair-measure" value={m} checked={measure === m} onChange={() => onMeasureChange(m)} className="accent-sea-600" />
            {m === "kappa" ? "Cohen's kappa" : "Percent agreement"}
          </label>
        ))}
      </fieldset>
      {reviewers.length < 2 ? (
        <p className="text-sm text-slate-600">No pair of reviewers has read the same exam in this range.</p>
      ) : (
        <div className="overflow-x-auto rounded-lg border border-slate-200 bg-white p-3">
          <table className="border-separate border-spacing-1 text-sm">
            <caption className="sr-only">
              {word} per pair of reviewers on {criterionLabel}
            </caption>
            <thead>
              <tr>
                <td />
                {reviewers.map((r) => (
                  <th key={r.id} scope="col" className="max-w-28 px-1 pb-1 text-left align-bottom text-xs font-semibold text-slate-700">
                    {r.name}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {reviewers.map((row) => (
                <tr key={row.id}>
                  <th scope="row" className="whitespace-nowrap pr-2 text-right text-xs font-semibold text-slate-700">
                    {row.name}
                  </th>
                  {reviewers.map((col) => {
                    if (row.id === col.id)
                      return (
                        <td key={col.id} className="size-16 rounded bg-paper-200 text-center text-xs text-slate-500">
                          <span aria-hidden="true">·</span>
                          <span className="sr-only">same reviewer</span>
                        </td>
                      );
                    const p = byPair.get(`${row.id}|${col.id}`);
                    const v = p ? p[measure] : null;
                    if (!p || v === null)
                      return (
                        <td
                          key={col.id}
                          title={p ? `Not computable over ${p.units} shared exams` : "No exam read by both"}
                          className="size-16 rounded border border-dashed border-slate-300 text-center text-xs text-slate-600"
                        >
                          —{p ? <span className="block">n {p.units}</span> : null}
                        </td>
                      );
                    // Kappa can be negative: the scale covers 0..1 and anything below 0 is lightest.
                    const { fill } = sequentialColour(v);
                    return (
                      <td
                        key={col.id}
                        style={{ backgroundColor: fill }}
                        className="size-16 rounded text-center tabular-nums"
                        title={`${row.name} and ${col.name}: ${word} ${measure === "kappa" ? formatCoefficient(v) : formatPercent(v)}, ${p.units} exams`}
                      >
                        {/* A paper chip under the figures keeps them at AA contrast on every shade. */}
                        <span className="inline-block rounded bg-paper-50/90 px-1.5 py-0.5 text-ink-950">
                          <span className="block font-semibold">{measure === "kappa" ? formatCoefficient(v) : formatPercent(v)}</span>
                          <span className="block text-xs">n {p.units}</span>
                        </span>
                      </td>
                    );
                  })}
                </tr>
              ))}
            </tbody>
          </table>
          <ScaleKey measure={measure} />
        </div>
      )}
    </ReportSection>
  );
}

function ScaleKey({ measure }: { measure: PairMeasure }) {
  const steps = [0, 0.25, 0.5, 0.75, 1];
  return (
    <div className="mt-3 flex items-center gap-2 text-xs text-slate-700" aria-hidden="true">
      <span>Scale</span>
      {steps.map((s) => {
        const { fill, text } = sequentialColour(s);
        return (
          <span key={s} style={{ backgroundColor: fill, color: text }} className="rounded px-2 py-0.5 tabular-nums">
            {measure === "kappa" ? formatCoefficient(s) : formatPercent(s)}
          </span>
        );
      })}
    </div>
  );
}
