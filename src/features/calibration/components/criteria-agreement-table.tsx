// Agreement among all of a set's reviewers, per criterion: Fleiss' kappa with its 95 %
// interval, Krippendorff's alpha, and the band in words. Anything not computable shows "—".
import { ReportSection, tableClasses as t } from "../../../components/ui/report-section";
import { Coefficient, NotComputable } from "../../../components/ui/coefficient";
import type { CalibrationCriterion } from "../api/calibration";
import { bandWords, formatCoefficient } from "../../../lib/stat-format";

function reasonFor(c: CalibrationCriterion): string {
  if (c.units === 0) return "No exam has been read by every reviewer yet.";
  if (c.units < 2) return "Only one exam has been read by every reviewer: one exam cannot separate agreement from chance.";
  return "Not computable from these reads (for example, every reviewer gave one and the same value).";
}

export function CriteriaAgreementTable({ criteria }: { criteria: CalibrationCriterion[] }) {
  return (
    <ReportSection
      title="Agreement per criterion"
      description={
        <>
          Fleiss&apos; kappa over the exams every reviewer has read, with its 95 % interval; Krippendorff&apos;s alpha over all reads, missing ones included.
          The band is read from kappa. For the reads of findings, each finding of each exam counts as one unit.
        </>
      }
    >
      <div className={t.wrap}>
        <table className={t.table}>
          <caption className="sr-only">Agreement among the set&apos;s reviewers per criterion</caption>
          <thead className={t.thead}>
            <tr>
              <th scope="col" className={t.th}>
                Criterion
              </th>
              <th scope="col" className={t.thNum}>
                Read by all
              </th>
              <th scope="col" className={t.thNum}>
                Fleiss&apos; kappa
              </th>
              <th scope="col" className={t.thNum}>
                Krippendorff&apos;s alpha
              </th>
              <th scope="col" className={t.th}>
                Band
              </th>
            </tr>
          </thead>
          <tbody className={t.tbody}>
            {criteria.map((c) => {
              const reason = reasonFor(c);
              const kappa = c.fleiss?.value ?? null;
              return (
                <tr key={c.key} className="align-top" data-criterion={c.key}>
                  <th scope="row" className="px-3 py-2 font-semibold text-ink-900">
                    {c.label}
                  </th>
                  <td className={t.tdNum}>{c.units}</td>
                  <td className={t.tdNum}>
                    <Coefficient label="fleiss" value={kappa} ci={c.fleiss?.ci95} reason={reason} />
                  </td>
                  <td className={t.tdNum}>
                    {c.alpha.value === null ? (
                      <NotComputable reason={reason} />
                    ) : (
                      <span data-stat="alpha" className="font-semibold">
                        {formatCoefficient(c.alpha.value)}
                      </span>
                    )}
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
