// Oversight → Calibration: the QA lead's calibration sets, newest first, with how many of
// their blinded calibration reads reviewers have submitted. Each opens its results.
import { Link, useLocation } from "react-router-dom";
import { buttonClasses } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { PageHeader } from "../../../components/ui/page-header";
import { ProgressBar } from "../../../components/ui/progress-bar";
import { tableClasses as t } from "../../../components/ui/report-section";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { StatusTag } from "../../../components/ui/status-tag";
import { formatDate } from "../../../lib/format";
import { formatCount } from "../../../lib/stat-format";
import { useCalibrationSets } from "../api/calibration";

function NewSetLink() {
  return (
    <Link to="/oversight/calibration/new" className={buttonClasses("primary")}>
      New calibration set
    </Link>
  );
}

export default function CalibrationSetsPage() {
  const list = useCalibrationSets();
  const location = useLocation();
  const notice = (location.state as { notice?: string } | null)?.notice ?? null;

  return (
    <div>
      <PageHeader
        eyebrow="Oversight"
        title="Calibration"
        description="Send the same exams to several reviewers as blinded calibration reads, then see how closely they agree with each other and with a reference answer."
        actions={<NewSetLink />}
      />
      {notice ? (
        <div className="mb-4">
          <FormMessage tone="success" message={notice} />
        </div>
      ) : null}
      {list.isPending ? (
        <LoadingState label="Loading calibration sets…" />
      ) : list.isError ? (
        <ErrorState error={list.error} onRetry={() => void list.refetch()} retrying={list.isFetching} />
      ) : list.data.items.length === 0 ? (
        <EmptyState title="No calibration sets yet" action={<NewSetLink />}>
          A calibration set is a handful of exams every chosen reviewer reads from their normal queue, without seeing the others&apos; scores.
        </EmptyState>
      ) : (
        <div className={t.wrap}>
          <table className={t.table}>
            <caption className="sr-only">Calibration sets and their progress</caption>
            <thead className={t.thead}>
              <tr>
                <th scope="col" className={t.th}>
                  Name
                </th>
                <th scope="col" className={t.th}>
                  Created
                </th>
                <th scope="col" className={t.thNum}>
                  Exams
                </th>
                <th scope="col" className={t.th}>
                  Reads done
                </th>
              </tr>
            </thead>
            <tbody className={t.tbody}>
              {list.data.items.map((s) => {
                const complete = s.reads > 0 && s.done >= s.reads;
                return (
                  <tr key={s.id} className="align-top">
                    <td className={t.td}>
                      <Link to={`/oversight/calibration/${s.id}`} className="font-semibold text-sea-700 underline-offset-2 hover:underline">
                        {s.name}
                      </Link>
                    </td>
                    <td className={`${t.td} whitespace-nowrap tabular-nums`}>{formatDate(s.createdAt)}</td>
                    <td className={t.tdNum}>{formatCount(s.exams)}</td>
                    <td className={`${t.td} min-w-56`}>
                      <div className="flex items-center justify-between gap-2">
                        <span className="tabular-nums">
                          {formatCount(s.done)} / {formatCount(s.reads)}
                        </span>
                        {complete ? <StatusTag tone="good">Complete</StatusTag> : <StatusTag tone="waiting">In progress</StatusTag>}
                      </div>
                      <div className="mt-1">
                        <ProgressBar value={s.reads ? s.done / s.reads : 0} label={`Reads done in ${s.name}`} />
                      </div>
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}
