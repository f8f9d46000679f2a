// Each reviewer against the set's reference answers: scores and reads of findings that
// matched the reference exactly, out of those compared, then exam by exam every reference
// value beside each reviewer's. A set without reference answers says so instead of zeros.
import { CircleCheck, CircleX, Clock } from "lucide-react";
import { ExportCsvButton } from "../../../components/ui/export-csv-button";
import { ReportSection, tableClasses as t } from "../../../components/ui/report-section";
import type { CalibrationResults, MatchCount, ReferenceRow } from "../api/calibration";
import { formatPercent } from "../../../lib/stat-format";

function Count({ count, what }: { count: MatchCount; what: string }) {
  if (count.compared === 0) return <span className="text-slate-600">none compared</span>;
  return (
    <span className="inline-flex flex-col items-end" data-stat={what}>
      <span className="font-semibold">
        {count.matched} / {count.compared}
      </span>
      <span className="text-xs text-slate-600">{count.share === null ? "—" : formatPercent(count.share)}</span>
    </span>
  );
}

const overall = (a: MatchCount, b: MatchCount): MatchCount => {
  const compared = a.compared + b.compared;
  const matched = a.matched + b.matched;
  return { compared, matched, share: compared ? matched / compared : null };
};

/** A reviewer's value beside the reference: the value and, in words and icon, whether it matches. */
function Given({ given }: { given: ReferenceRow["given"][number] }) {
  if (given.matches === null) {
    return (
      <span className="inline-flex items-center gap-1 text-slate-600">
        <Clock aria-hidden="true" className="size-3.5" />
        not read yet
      </span>
    );
  }
  return (
    <span className="inline-flex flex-wrap items-center gap-x-1.5" data-matches={given.matches}>
      <span>{given.label}</span>
      {given.matches ? (
        <span className="inline-flex items-center gap-0.5 text-xs font-semibold text-sea-800">
          <CircleCheck aria-hidden="true" className="size-3.5" />
          matches
        </span>
      ) : (
        <span className="inline-flex items-center gap-0.5 text-xs font-semibold text-coral-700">
          <CircleX aria-hidden="true" className="size-3.5" />
          differs
        </span>
      )}
    </span>
  );
}

export function ReferenceTable({ results }: { results: CalibrationResults }) {
  const { vsReference: rows, referenceDetail, reviewers } = results;
  const withReference = results.exams.filter((e) => e.hasReference);
  const name = (id: string) => reviewers.find((r) => r.id === id)?.name ?? "";
  const fileStem = results.name.replace(/[^\w-]+/g, "-").toLowerCase() || "calibration";

  return (
    <ReportSection
      title="Against the reference"
      description={
        withReference.length === 0
          ? "No exam of this set was given a reference answer."
          : `Values that match the reference answer exactly, out of those compared, on the ${withReference.length === 1 ? "exam" : `${withReference.length} exams`} given one (${withReference.map((e) => e.code).join(", ")}).`
      }
      actions={
        withReference.length ? (
          <ExportCsvButton
            filename={`${fileStem}-reference.csv`}
            what="each reviewer's values against the reference answers"
            header={["exam", "kind", "item", "reference", "reviewer", "given", "matches"]}
            rows={() =>
              referenceDetail.flatMap((d) =>
                d.rows.flatMap((r) =>
                  r.given.map((g) => [
                    d.code,
                    r.kind,
                    r.label,
                    r.reference.label,
                    name(g.reviewerId),
                    g.label,
                    g.matches === null ? null : g.matches ? "yes" : "no",
                  ]),
                ),
              )
            }
          />
        ) : null
      }
    >
      {withReference.length === 0 ? null : (
        <>
          <div className={t.wrap}>
            <table className={t.table}>
              <caption className="sr-only">Each reviewer&apos;s matches with the reference answers</caption>
              <thead className={t.thead}>
                <tr>
                  <th scope="col" className={t.th}>
                    Reviewer
                  </th>
                  <th scope="col" className={t.thNum}>
                    Scores matched
                  </th>
                  <th scope="col" className={t.thNum}>
                    Finding reads matched
                  </th>
                  <th scope="col" className={t.thNum}>
                    All values
                  </th>
                </tr>
              </thead>
              <tbody className={t.tbody}>
                {rows.map((r) => (
                  <tr key={r.reviewer.id} className="align-top" data-reviewer={r.reviewer.name}>
                    <th scope="row" className="px-3 py-2 font-semibold text-ink-900">
                      {r.reviewer.name}
                    </th>
                    <td className={t.tdNum}>
                      <Count count={r} what="scores" />
                    </td>
                    <td className={t.tdNum}>
                      <Count count={r.reads} what="reads" />
                    </td>
                    <td className={t.tdNum}>
                      <Count count={overall(r, r.reads)} what="all" />
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          {referenceDetail.map((d) => {
            const exam = results.exams.find((e) => e.id === d.examId);
            return (
              <div key={d.examId} className="mt-4">
                <h3 className="mb-1 text-sm font-semibold text-ink-900">
                  <span className="font-mono">{d.code}</span>
                  {exam ? <span className="font-normal text-slate-600"> · {exam.application.name}</span> : null}
                </h3>
                <div className={t.wrap}>
                  <table className={t.table}>
                    <caption className="sr-only">Reference answer for {d.code} beside each reviewer&apos;s read</caption>
                    <thead className={t.thead}>
                      <tr>
                        <th scope="col" className={t.th}>
                          Criterion or finding
                        </th>
                        <th scope="col" className={t.th}>
                          Reference
                        </th>
                        {reviewers.map((rv) => (
                          <th key={rv.id} scope="col" className={t.th}>
                            {rv.name}
                          </th>
                        ))}
                      </tr>
                    </thead>
                    <tbody className={t.tbody}>
                      {d.rows.map((row) => (
                        <tr key={`${row.kind}-${row.key}`} className="align-top" data-item={`${row.kind}:${row.key}`}>
                          <th scope="row" className="px-3 py-2 font-semibold text-ink-900">
                            {row.label}
                            {row.kind === "read" ? <span className="block text-xs font-normal text-slate-600">finding</span> : null}
                          </th>
                          <td className={`${t.td} font-semibold`}>{row.reference.label}</td>
                          {row.given.map((g) => (
                            <td key={g.reviewerId} className={t.td}>
                              <Given given={g} />
                            </td>
                          ))}
                        </tr>
                      ))}
                    </tbody>
                  </table>
                </div>
              </div>
            );
          })}
        </>
      )}
    </ReportSection>
  );
}
