// One exam: its details, the sonographer's reads and every clip with its player and live
// processing state. A draft can still be labelled, redacted and fixed here; a submitted
// exam is read-only, except for its confirmatory results (what a later CT, formal echo,
// surgery or follow-up showed), which its sonographer or a QA lead records here.
import { useEffect } from "react";
import { Link, useLocation, useParams } from "react-router-dom";
import { useQuery } from "@tanstack/react-query";
import { ConfirmationsForm } from "../../progress";
import { buttonClasses } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { PageHeader } from "../../../components/ui/page-header";
import { EmptyState, LoadingState, QueryErrorState } from "../../../components/ui/states";
import { READ_LABELS, SETTING_LABELS, TRANSDUCER_LABELS, applicationVersionQuery } from "../../../lib/catalogue";
import { ApplicationCautions } from "../../../components/ui/cautions";
import { formatDateTime } from "../../../lib/format";
import { hasAnyRole, sessionQuery } from "../../../lib/session";
import { isProcessing, useExam } from "../api/exams";
import { ClipPanel } from "../components/clip-panel";
import { DiscardDraftButton } from "../components/discard-draft-button";
import { ExamStatusTag } from "../components/exam-status-tag";

/** The reads in the application's own order of findings (the server's order is by key). */
function orderedReads<T extends { key: string }>(reads: T[], findings: { key: string }[]): T[] {
  const at = (key: string) => {
    const i = findings.findIndex((f) => f.key === key);
    return i < 0 ? findings.length : i;
  };
  return [...reads].sort((a, b) => at(a.key) - at(b.key));
}

export default function ExamPage() {
  const { id = "" } = useParams();
  const location = useLocation();
  const notice = (location.state as { notice?: string } | null)?.notice ?? null;
  const query = useExam(id);
  const exam = query.data;
  // The labels of the version the exam was recorded under, which a later edit of the catalogue does not change.
  const version = useQuery(applicationVersionQuery(exam?.guide.applicationId ?? ""));
  const application = version.data?.application;
  const editable = exam?.status === "draft";
  const session = useQuery(sessionQuery);
  // Hiding the section only spares others a refusal: the server decides who may enter results.
  const mayConfirm = !!exam && !editable && (hasAnyRole(session.data, ["qa_lead"]) || (!!session.data && exam.sonographer?.id === session.data.id));

  // A link to one clip (#clip-…) scrolls to it once the exam is there.
  const loaded = !!exam;
  useEffect(() => {
    if (loaded && location.hash) document.getElementById(location.hash.slice(1))?.scrollIntoView();
  }, [loaded, location.hash]);

  return (
    <div>
      <PageHeader
        eyebrow="My exams"
        title={exam ? `Exam ${exam.code}` : "Exam"}
        actions={
          exam && editable ? (
            <>
              <Link to={`/exams/${exam.id}/edit`} className={buttonClasses("primary")}>
                Continue editing
              </Link>
              <DiscardDraftButton exam={exam} />
            </>
          ) : undefined
        }
      />
      {notice ? (
        <div className="mb-4">
          <FormMessage tone="success" message={notice} />
        </div>
      ) : null}
      {query.isPending ? (
        <LoadingState label="Loading the exam…" />
      ) : query.isError ? (
        <QueryErrorState query={query} notFound={{ title: "No such exam", message: "This exam does not exist or is not visible to you." }} />
      ) : (
        <div className="space-y-6">
          <section aria-labelledby="summary-heading" className="rounded-lg border border-slate-200 bg-white p-5">
            <div className="flex flex-wrap items-center gap-3">
              <h2 id="summary-heading" className="text-lg font-semibold text-ink-950">
                {query.data.application.name}
              </h2>
              <ExamStatusTag status={query.data.status} />
              {editable ? <span className="text-sm text-slate-600">Not yet sent for review.</span> : null}
            </div>
            <dl className="mt-4 grid gap-x-6 gap-y-2 text-sm sm:grid-cols-[10rem_1fr]">
              <dt className="font-semibold text-slate-700">Performed</dt>
              <dd className="tabular-nums text-ink-900">{formatDateTime(query.data.performedAt)}</dd>
              <dt className="font-semibold text-slate-700">Setting</dt>
              <dd className="text-ink-900">{SETTING_LABELS[query.data.setting]}</dd>
              <dt className="font-semibold text-slate-700">Transducer</dt>
              <dd className="text-ink-900">{TRANSDUCER_LABELS[query.data.transducer]}</dd>
              <dt className="font-semibold text-slate-700">Preset</dt>
              <dd className="text-ink-900">{query.data.preset || "—"}</dd>
              <dt className="font-semibold text-slate-700">Indication</dt>
              <dd className="whitespace-pre-line text-ink-900">{query.data.indication || "—"}</dd>
              <dt className="font-semibold text-slate-700">Submitted</dt>
              <dd className="tabular-nums text-ink-900">{query.data.submittedAt ? formatDateTime(query.data.submittedAt) : "Not yet"}</dd>
              <dt className="font-semibold text-slate-700">Catalogue</dt>
              <dd className="tabular-nums text-ink-900">
                {query.data.application.name}, version {query.data.guide.version}
              </dd>
            </dl>
            {query.data.guide.cautions.length > 0 ? (
              <div className="mt-4">
                <ApplicationCautions cautions={query.data.guide.cautions} />
              </div>
            ) : null}
          </section>

          <section aria-labelledby="reads-heading" className="rounded-lg border border-slate-200 bg-white p-5">
            <h2 id="reads-heading" className="text-lg font-semibold text-ink-950">
              Your reads
            </h2>
            {query.data.findings.length === 0 ? (
              <p className="mt-2 text-sm text-slate-600">No findings read yet.</p>
            ) : (
              <dl className="mt-3 grid gap-x-6 gap-y-1.5 text-sm sm:grid-cols-[minmax(0,20rem)_1fr]">
                {orderedReads(query.data.findings, application?.findings ?? []).map((f) => (
                  <div key={f.key} className="contents">
                    <dt className="text-ink-900">{application?.findings.find((x) => x.key === f.key)?.label ?? f.key}</dt>
                    <dd className="font-semibold text-ink-950">{READ_LABELS[f.read]}</dd>
                  </div>
                ))}
              </dl>
            )}
          </section>

          {mayConfirm ? <ConfirmationsForm examId={query.data.id} collapsible /> : null}

          <section aria-labelledby="clips-heading">
            <div className="mb-3 flex flex-wrap items-center gap-3">
              <h2 id="clips-heading" className="text-lg font-semibold text-ink-950">
                Clips
              </h2>
              {isProcessing(query.data) ? (
                <span role="status" className="text-sm text-slate-600">
                  Processing — this page updates by itself.
                </span>
              ) : null}
            </div>
            {query.data.clips.length === 0 ? (
              <EmptyState
                title="No clips yet"
                action={
                  editable ? (
                    <Link to={`/exams/${query.data.id}/edit`} className={buttonClasses("primary")}>
                      Add clips
                    </Link>
                  ) : undefined
                }
              />
            ) : (
              <div className="space-y-4">
                {query.data.clips.map((clip, i) => (
                  <ClipPanel key={clip.id} examId={query.data.id} clip={clip} index={i} views={application?.views ?? []} editable={editable} />
                ))}
              </div>
            )}
          </section>
        </div>
      )}
    </div>
  );
}
