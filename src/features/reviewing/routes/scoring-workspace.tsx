// /queue/:assignmentId — the scoring workspace of an exam I hold. This screen loads the
// workspace (usually already in the cache from the claim) and shows its loading and error
// states; the workspace itself lives in WorkspaceView, keyed by assignment so each exam
// starts fresh.
import { Link, useLocation, useParams, useSearchParams } from "react-router-dom";
import { buttonClasses } from "../../../components/ui/button";
import { PageHeader } from "../../../components/ui/page-header";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { isApiError } from "../../../lib/api-errors";
import { useWorkspace } from "../api/scoring";
import { WorkspaceView } from "../components/workspace-view";

export default function ScoringWorkspacePage() {
  const { assignmentId = "" } = useParams();
  const [params] = useSearchParams();
  const location = useLocation();
  const notice = (location.state as { notice?: string } | null)?.notice ?? null;
  const query = useWorkspace(assignmentId);
  const backToQueue = (
    <Link to="/queue" className={buttonClasses("primary")}>
      Back to the queue
    </Link>
  );

  if (query.isPending) {
    return (
      <div>
        <PageHeader title="Scoring" eyebrow="Queue" />
        <LoadingState label="Loading the exam…" />
      </div>
    );
  }
  if (query.isError) {
    const expired = isApiError(query.error, 409) && query.error.code === "claim_expired";
    const gone = expired || isApiError(query.error, 404) || isApiError(query.error, 400);
    return (
      <div>
        <PageHeader title="Scoring" eyebrow="Queue" />
        {gone ? (
          <EmptyState title="This exam is not in your hands" action={backToQueue}>
            {expired
              ? "Your claim ran out and the exam went back to the queue. Start the next one from the queue to claim it again."
              : "It was released, reassigned or never claimed by you. Start the next one from the queue."}
          </EmptyState>
        ) : (
          <ErrorState error={query.error} onRetry={() => void query.refetch()} retrying={query.isFetching} />
        )}
      </div>
    );
  }
  if (query.data.assignment.state !== "claimed") {
    return (
      <div>
        <PageHeader title={`Exam ${query.data.exam.code}`} eyebrow="Queue" />
        <EmptyState
          title={query.data.assignment.state === "submitted" ? "You have submitted this review" : "You no longer hold this exam"}
          action={backToQueue}
        >
          {query.data.assignment.state === "submitted"
            ? "Its scores are recorded. The next exam waits in the queue."
            : "The claim ended and the exam went back to the queue."}
        </EmptyState>
      </div>
    );
  }
  return <WorkspaceView key={assignmentId} workspace={query.data} application={params.get("application")} notice={notice} />;
}
