// Submit: continue a draft — its details, clips, attestation and Submit.
import { useQuery } from "@tanstack/react-query";
import { Link, useLocation, useParams } from "react-router-dom";
import { buttonClasses } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { PageHeader } from "../../../components/ui/page-header";
import { ErrorState, LoadingState, QueryErrorState } from "../../../components/ui/states";
import { applicationsQuery } from "../../../lib/catalogue";
import { useExam } from "../api/exams";
import { DiscardDraftButton } from "../components/discard-draft-button";
import { ExamEditor } from "../components/exam-editor";
import { ExamStatusTag } from "../components/exam-status-tag";

export default function EditExamPage() {
  const { id = "" } = useParams();
  const location = useLocation();
  const notice = (location.state as { notice?: string } | null)?.notice ?? null;
  const exam = useExam(id);
  const apps = useQuery(applicationsQuery);
  const title = exam.data ? `Draft ${exam.data.code}` : "Draft";

  return (
    <div>
      <PageHeader
        eyebrow="Submit"
        title={title}
        description="Details, clips and your read. Nothing is sent for review until you submit."
        actions={
          exam.data?.status === "draft" ? (
            <>
              <Link to={`/exams/${id}`} className={buttonClasses("secondary")}>
                Exam page
              </Link>
              <DiscardDraftButton exam={exam.data} />
            </>
          ) : undefined
        }
      />
      {notice ? (
        <div className="mb-4">
          <FormMessage tone="success" message={notice} />
        </div>
      ) : null}
      {exam.isPending || apps.isPending ? (
        <LoadingState label="Loading the draft…" />
      ) : exam.isError ? (
        <QueryErrorState query={exam} notFound={{ title: "No such exam", message: "This exam does not exist or is not yours." }} />
      ) : apps.isError ? (
        <ErrorState error={apps.error} onRetry={() => void apps.refetch()} retrying={apps.isFetching} />
      ) : exam.data.status !== "draft" ? (
        <div className="rounded-lg border border-slate-200 bg-white p-5">
          <p className="flex items-center gap-2 text-ink-900">
            <ExamStatusTag status={exam.data.status} /> This exam was submitted and can no longer be changed.
          </p>
          <Link to={`/exams/${id}`} className={buttonClasses("primary", "md", "mt-4")}>
            Open the exam
          </Link>
        </div>
      ) : (
        <ExamEditor key={exam.data.id} exam={exam.data} applications={apps.data.applications} />
      )}
    </div>
  );
}
