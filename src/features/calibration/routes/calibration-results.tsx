// Oversight → Calibration → one set: who takes part, which exams (and which carry a reference
// answer), how closely the reviewers agree per criterion, and how each compares with the
// reference answers.
import { Link, useLocation, useParams } from "react-router-dom";
import { buttonClasses } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { PageHeader } from "../../../components/ui/page-header";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { StatusTag } from "../../../components/ui/status-tag";
import { useCalibrationResults } from "../api/calibration";
import { CriteriaAgreementTable } from "../components/criteria-agreement-table";
import { ReferenceTable } from "../components/reference-table";

const backLink = (
  <Link to="/oversight/calibration" className={buttonClasses("secondary")}>
    All calibration sets
  </Link>
);

export default function CalibrationResultsPage() {
  const { id = "" } = useParams();
  const results = useCalibrationResults(id);
  const location = useLocation();
  const notice = (location.state as { notice?: string } | null)?.notice ?? null;
  const data = results.data;

  return (
    <div>
      <PageHeader
        eyebrow="Oversight · Calibration"
        title={data?.name ?? "Calibration set"}
        description="Results fill in as reviewers submit their calibration reads from their queues."
        actions={backLink}
      />
      {notice ? (
        <div className="mb-4">
          <FormMessage tone="success" message={notice} />
        </div>
      ) : null}
      {results.isError ? (
        <ErrorState error={results.error} onRetry={() => void results.refetch()} retrying={results.isFetching} />
      ) : !data ? (
        <LoadingState label="Computing calibration results…" />
      ) : (
        <>
          <dl className="mb-8 grid gap-4 rounded-lg border border-slate-200 bg-white p-4 sm:grid-cols-2">
            <div>
              <dt className="text-xs font-semibold uppercase tracking-wide text-slate-700">Exams ({data.exams.length})</dt>
              <dd className="mt-1 flex flex-wrap gap-x-4 gap-y-1">
                {data.exams.map((e) => (
                  <span key={e.id} className="inline-flex items-center gap-1.5" data-exam={e.code}>
                    <Link to={`/exams/${e.id}`} className="font-mono text-sm font-semibold text-sea-700 underline-offset-2 hover:underline">
                      {e.code}
                    </Link>
                    <span className="text-xs text-slate-600">{e.application.name}</span>
                    {e.hasReference ? <StatusTag tone="neutral">Reference answer</StatusTag> : null}
                  </span>
                ))}
              </dd>
            </div>
            <div>
              <dt className="text-xs font-semibold uppercase tracking-wide text-slate-700">Reviewers with reads ({data.reviewers.length})</dt>
              <dd className="mt-1 text-sm text-ink-900">{data.reviewers.map((r) => r.name).join(", ") || "None yet"}</dd>
            </div>
          </dl>
          {data.reviewers.length === 0 ? (
            <EmptyState title="No calibration reads submitted yet">
              The reads wait in the reviewers&apos; queues. Agreement appears once reviewers submit them.
            </EmptyState>
          ) : (
            <>
              {data.criteria.length === 0 ? (
                <EmptyState title="No criteria to compare">The set&apos;s rubric has no criteria for these exams.</EmptyState>
              ) : (
                <CriteriaAgreementTable criteria={data.criteria} />
              )}
              <ReferenceTable results={data} />
            </>
          )}
        </>
      )}
    </div>
  );
}
