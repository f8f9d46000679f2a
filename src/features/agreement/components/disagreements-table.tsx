// The exams where two reads of the chosen criterion differ, each linking to the exam.
import { Link } from "react-router-dom";
import { ExportCsvButton } from "../../../components/ui/export-csv-button";
import { ReportSection, tableClasses as t } from "../../../components/ui/report-section";
import type { Disagreement } from "../api/agreement";

const show = (v: string | number | null) => (v === null ? "—" : String(v));

export function DisagreementsTable({
  rows,
  criterionLabel,
  filename,
  labelOf,
}: {
  rows: Disagreement[];
  criterionLabel: string;
  filename: string;
  labelOf: (v: string | number | null) => string;
}) {
  return (
    <ReportSection
      title="Exams in disagreement"
      description={`Exams whose two reads of ${criterionLabel} differ (${rows.length}).`}
      actions={
        <ExportCsvButton
          what="exams in disagreement"
          filename={filename}
          header={["exam", "application", "first_value", "second_value"]}
          rows={() => rows.map((d) => [d.code, d.application, show(d.a), show(d.b)])}
        />
      }
    >
      {rows.length === 0 ? (
        <p className="rounded-lg border border-dashed border-slate-300 bg-white px-4 py-3 text-sm text-slate-600">
          Every double read agrees on {criterionLabel} in this range.
        </p>
      ) : (
        <div className={t.wrap}>
          <table className={t.table}>
            <caption className="sr-only">Exams in disagreement on {criterionLabel}</caption>
            <thead className={t.thead}>
              <tr>
                <th scope="col" className={t.th}>
                  Exam
                </th>
                <th scope="col" className={t.th}>
                  Application
                </th>
                <th scope="col" className={t.th}>
                  One read
                </th>
                <th scope="col" className={t.th}>
                  Other read
                </th>
              </tr>
            </thead>
            <tbody className={t.tbody}>
              {rows.map((d) => (
                <tr key={d.examId}>
                  <td className={t.td}>
                    <Link to={`/exams/${d.examId}`} className="font-mono font-semibold text-sea-700 underline-offset-2 hover:underline">
                      {d.code}
                    </Link>
                  </td>
                  <td className={t.td}>{d.application}</td>
                  <td className={`${t.td} tabular-nums`}>{labelOf(d.a)}</td>
                  <td className={`${t.td} tabular-nums`}>{labelOf(d.b)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </ReportSection>
  );
}
