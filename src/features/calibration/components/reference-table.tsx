// Each reviewer against the set's reference answers: scores that matched exactly, out of
// those compared. A set without reference answers says so instead of showing zeros.
import { ReportSection, tableClasses as t } from "../../../components/ui/report-section";
import type { ReviewerVsReference } from "../api/calibration";
import { formatPercent } from "./stat-format";

export function ReferenceTable({ rows }: { rows: ReviewerVsReference[] }) {
  return (
    <ReportSection title="Against the reference" description="The share of reference scores each reviewer matched exactly, on exams given a reference answer.">
      <div className={t.wrap}>
        <table className={t.table}>
          <caption className="sr-only">Each reviewer&apos;s matches with the reference answers</caption>
          <thead className={t.thead}>
            <tr>
              <th scope="col" className={t.th}>
                Reviewer
              </th>
              <th scope="col" className={t.thNum}>
                Matched / compared
              </th>
              <th scope="col" className={t.thNum}>
                Share
              </th>
            </tr>
          </thead>
          <tbody className={t.tbody}>
            {rows.map((r) => (
              <tr key={r.reviewer.id}>
                <th scope="row" className="px-3 py-2 font-semibold text-ink-900">
                  {r.reviewer.name}
                </th>
                {r.compared === 0 ? (
                  <td colSpan={2} className={`${t.td} text-right text-slate-600`}>
                    no reference given
                  </td>
                ) : (
                  <>
                    <td className={t.tdNum}>
                      {r.matched} / {r.compared}
                    </td>
                    <td className={t.tdNum}>{r.share === null ? "—" : formatPercent(r.share)}</td>
                  </>
                )}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </ReportSection>
  );
}
