// Submit: a new exam. The form saves a draft; clips follow on the draft's own page.
import { useQuery } from "@tanstack/react-query";
import { PageHeader } from "../../../components/ui/page-header";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { applicationsQuery } from "../../../lib/catalogue";
import { ExamEditor } from "../components/exam-editor";

export default function NewExamPage() {
  const apps = useQuery(applicationsQuery);
  return (
    <div>
      <PageHeader
        eyebrow="Submit"
        title="New exam"
        description="Describe the scan and record your read, then add the clips. Nothing is sent for review until you submit."
      />
      {apps.isPending ? (
        <LoadingState label="Loading the program's applications…" />
      ) : apps.isError ? (
        <ErrorState error={apps.error} onRetry={() => void apps.refetch()} retrying={apps.isFetching} />
      ) : apps.data.applications.filter((a) => a.active).length === 0 ? (
        <EmptyState title="No applications to choose from">This program has no active applications yet. Ask your QA lead to set them up.</EmptyState>
      ) : (
        <ExamEditor applications={apps.data.applications} />
      )}
    </div>
  );
}
