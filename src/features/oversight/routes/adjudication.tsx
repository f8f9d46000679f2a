// One exam in adjudication: both reads side by side with the differences marked, the
// reviewers' comments, a link to the clips, the final result form and the hand-over.
import { Link, useNavigate, useParams } from "react-router-dom";
import { useQuery } from "@tanstack/react-query";
import { ExternalLink } from "lucide-react";
import { PageHeader } from "../../../components/ui/page-header";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { StatusTag } from "../../../components/ui/status-tag";
import { SETTING_LABELS, applicationVersionQuery } from "../../../lib/catalogue";
import { formatDateTime } from "../../../lib/format";
import { hasAnyRole, sessionQuery } from "../../../lib/session";
import { examReadsQuery, useAdjudicate, useAdjudications } from "../api/oversight";
import { AdjudicationForm } from "../components/adjudication-form";
import { disagreementLabel } from "../components/disagreement-label";
import { ReassignPanel } from "../components/reassign-panel";

export default function AdjudicationPage() {
  const { examId = "" } = useParams();
  const navigate = useNavigate();
  const list = useAdjudications();
  const exam = useQuery({ ...examReadsQuery(examId), enabled: !!examId });
  const { data: user } = useQuery(sessionQuery);
  const adjudicate = useAdjudicate();
  const item = list.data?.items.find((i) => i.examId === examId);
  // The findings of the version the exam was recorded under.
  const version = useQuery(applicationVersionQuery(item?.applicationId ?? ""));
  const application = version.data?.application;
  const findings = application?.findings ?? [];
  const findingLabels = Object.fromEntries(findings.map((f) => [f.key, f.label]));
  const sonographerReads = Object.fromEntries((exam.data?.findings ?? []).map((f) => [f.key, f.read]));

  return (
    <div>
      <PageHeader
        eyebrow="Adjudication"
        title={item ? `Exam ${item.examCode}` : "Adjudication"}
        description={
          item ? `${item.application.name} · ${SETTING_LABELS[item.setting]}${item.rubric ? ` · rubric version ${item.rubric.version}` : ""}` : undefined
        }
        actions={
          item ? (
            <Link
              to={`/exams/${item.examId}`}
              target="_blank"
              className="inline-flex items-center gap-1 rounded-md px-2 py-2 text-sm font-semibold text-sea-700 hover:bg-sea-50"
            >
              Watch the clips
              <ExternalLink aria-hidden="true" className="size-4" />
              <span className="sr-only">(opens in a new tab)</span>
            </Link>
          ) : undefined
        }
      />
      {list.isPending || (!!item && version.isPending) ? (
        <LoadingState label="Loading the reads…" />
      ) : list.isError ? (
        <ErrorState error={list.error} onRetry={() => void list.refetch()} retrying={list.isFetching} />
      ) : version.isError ? (
        <ErrorState error={version.error} onRetry={() => void version.refetch()} retrying={version.isFetching} />
      ) : !item ? (
        <EmptyState
          title="This exam is not waiting for adjudication"
          action={
            <Link to="/oversight/adjudication" className="font-semibold text-sea-700 underline-offset-2 hover:underline">
              Back to Adjudication
            </Link>
          }
        >
          It may have been settled already, or handed to another reviewer.
        </EmptyState>
      ) : !item.rubric ? (
        <ErrorState error={new Error("The rubric version these reads were made under is missing.")} />
      ) : (
        <div className="space-y-6">
          <div className="flex flex-wrap items-center gap-2" aria-label="Differences">
            <StatusTag tone="problem">
              Reads differ on {item.disagreements.length} {item.disagreements.length === 1 ? "item" : "items"}
            </StatusTag>
            <span className="text-sm text-ink-900">{item.disagreements.map((d) => disagreementLabel(d, item, findingLabels)).join(", ")}</span>
          </div>
          {exam.isError ? (
            <p className="text-sm text-slate-600">The clinician&apos;s own reads could not be loaded; the reviewers&apos; reads are shown.</p>
          ) : null}
          {exam.isPending ? (
            <LoadingState label="Loading the clinician's reads…" />
          ) : (
            <AdjudicationForm
              item={item}
              findings={findings}
              sonographerReads={sonographerReads}
              busy={adjudicate.isPending}
              error={adjudicate.error}
              onSubmit={(body) =>
                adjudicate.mutate(
                  { examId: item.examId, body },
                  {
                    onSuccess: (r) =>
                      navigate("/oversight/adjudication", {
                        state: {
                          notice:
                            `Final result set for ${item.examCode}: ${r.credit ? "counts toward credentialing" : "no credentialing credit"}.` +
                            (r.significantDisagreement.length ? " A clinically significant disagreement was added to Follow-ups." : ""),
                        },
                      }),
                  },
                )
              }
            />
          )}
          <section aria-labelledby="comments-heading" className="rounded-lg border border-slate-200 bg-white p-4">
            <h2 id="comments-heading" className="text-lg font-semibold text-ink-950">
              Reviewers&apos; comments
            </h2>
            <div className="mt-3 grid gap-4 md:grid-cols-2">
              {item.reads.map((r) => (
                <div key={r.kind} className="rounded-md border border-slate-200 bg-paper-50 p-3 text-sm">
                  <p className="text-xs text-slate-600">
                    <span className="font-semibold text-ink-900">
                      {r.kind === "primary" ? "Primary" : "Second"} read · {r.reviewer}
                    </span>{" "}
                    · <span className="tabular-nums">{formatDateTime(r.submittedAt)}</span>
                  </p>
                  <p className="mt-1 whitespace-pre-line text-ink-900">{r.feedback || "No comment."}</p>
                </div>
              ))}
            </div>
          </section>
          {hasAnyRole(user, ["qa_lead"]) ? <ReassignPanel item={item} /> : null}
        </div>
      )}
    </div>
  );
}
