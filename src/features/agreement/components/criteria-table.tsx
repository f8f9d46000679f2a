// Agreement per criterion: units read twice, percent agreement, Cohen's kappa (quadratic
// weights on ordinal criteria), Krippendorff's alpha and Gwet's AC1, each with its 95 %
// interval, and the Landis & Koch band in words.
import { ExportCsvButton } from "../../../components/ui/export-csv-button";
import { ReportSection, tableClasses as t } from "../../../components/ui/report-section";
import { Coefficient, NotComputable } from "../../../components/ui/coefficient";
import type { CriterionAgreement } from "../api/agreement";
import { bandWords, formatPercent } from "../../../lib/stat-format";

/** Why a coefficient could not be computed, in words. */
function missingReason(units: number, percentAgreement: number | null): string {
  if (units === 0) return "No exam in this range was read twice for this criterion.";
  if (units < 2) return "Only one exam was read twice: one unit cannot separate agreement from chance.";
  if (percentAgreement === 1)
    return "Every reviewer gave one and the same value, so chance agreement is total and the coefficient is 0/0. Percent agreement is the figure to read.";
  return "Not computable from these reads.";
}

const KAPPA_WEIGHTS = { quadratic: "quadratic weights", unweighted: "unweighted" } as const;

/** ", 1,000 resamples" from the first criterion with a bootstrap, else nothing. */
function bootstrapNote(criteria: CriterionAgreement[]): string {
  const samples = criteria.find((c) => c.alpha.bootstrap)?.alpha.bootstrap?.samples;
  return samples ? `, ${samples.toLocaleString("en")} resamples` : "";
}

export function CriteriaTable({ criteria, filename }: { criteria: CriterionAgreement[]; filename: string }) {
  const csvRows = () =>
    criteria.map((c) => [
      c.key,
      c.label,
      c.kind,
      c.units,
      c.percentAgreement,
      c.kappa.value,
      c.kappa.ci95?.[0],
      c.kappa.ci95?.[1],
      c.kappa.weights,
      c.alpha.value,
      c.alpha.ci95?.[0],
      c.alpha.ci95?.[1],
      c.alpha.level,
      c.ac1.value,
      c.ac1.ci95?.[0],
      c.ac1.ci95?.[1],
      c.band,
    ]);
  return (
    <ReportSection
      title="Agreement per criterion"
      description={
        <>
          Cohen&apos;s kappa uses quadratic weights on ordinal criteria and is unweighted otherwise; Krippendorff&apos;s alpha at the level named; Gwet&apos;s
          AC1. Intervals are 95 %; alpha&apos;s comes from resampling the double-read exams (the findings, for interpretation) with a fixed seed (bootstrap
          {bootstrapNote(criteria)}), so the same reads always give the same interval. The band follows Landis &amp; Koch (1977) on kappa.
        </>
      }
      actions={
        <ExportCsvButton
          what="agreement per criterion"
          filename={filename}
          header={[
            "criterion",
            "label",
            "kind",
            "units",
            "percent_agreement",
            "kappa",
            "kappa_ci_low",
            "kappa_ci_high",
            "kappa_weights",
            "alpha",
            "alpha_ci_low",
            "alpha_ci_high",
            "alpha_level",
            "ac1",
            "ac1_ci_low",
            "ac1_ci_high",
            "band",
          ]}
          rows={csvRows}
        />
      }
    >
      <div className={t.wrap}>
        <table className={t.table}>
          <caption className="sr-only">Agreement between reviewers per criterion, with 95 % intervals</caption>
          <thead className={t.thead}>
            <tr>
              <th scope="col" className={t.th}>
                Criterion
              </th>
              <th scope="col" className={t.thNum}>
                Read twice
              </th>
              <th scope="col" className={t.thNum}>
                Agreement
              </th>
              <th scope="col" className={t.thNum}>
                Cohen&apos;s kappa
              </th>
              <th scope="col" className={t.thNum}>
                Krippendorff&apos;s alpha
              </th>
              <th scope="col" className={t.thNum}>
                Gwet&apos;s AC1
              </th>
              <th scope="col" className={t.th}>
                Band
              </th>
            </tr>
          </thead>
          <tbody className={t.tbody}>
            {criteria.map((c) => {
              const reason = missingReason(c.units, c.percentAgreement);
              return (
                <tr key={c.key} className="align-top" data-criterion={c.key}>
                  <th scope="row" className="px-3 py-2 font-semibold text-ink-900">
                    {c.label}
                    <span className="block text-xs font-normal text-slate-600">{c.kind}</span>
                  </th>
                  <td className={t.tdNum}>{c.units}</td>
                  <td className={t.tdNum}>{c.percentAgreement === null ? <NotComputable reason={reason} /> : formatPercent(c.percentAgreement)}</td>
                  <td className={t.tdNum}>
                    <Coefficient label="kappa" value={c.kappa.value} ci={c.kappa.ci95} reason={reason} />
                    <span className="block text-xs text-slate-600">{KAPPA_WEIGHTS[c.kappa.weights] ?? c.kappa.weights}</span>
                  </td>
                  <td className={t.tdNum}>
                    <Coefficient label="alpha" value={c.alpha.value} ci={c.alpha.ci95} reason={reason} />
                    <span className="block text-xs text-slate-600">{c.alpha.level}</span>
                  </td>
                  <td className={t.tdNum}>
                    <Coefficient label="ac1" value={c.ac1.value} ci={c.ac1.ci95} reason={reason} />
                  </td>
                  <td className={t.td}>{c.band ? bandWords(c.band) : <NotComputable reason={reason} />}</td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
    </ReportSection>
  );
}
