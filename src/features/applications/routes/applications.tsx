// Setup → Applications: the catalogue of exam types this program reviews. Read-only until
// editing is built; typical depth is a starting value for hints, not a rule.
import { PageHeader } from "../../../components/ui/page-header";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { useApplications } from "../api/applications";
import { ApplicationCard } from "../components/application-card";

export default function ApplicationsPage() {
  const query = useApplications();
  const applications = query.data?.applications ?? [];
  const active = applications.filter((a) => a.active).length;
  return (
    <div>
      <PageHeader
        eyebrow="Setup"
        title="Applications"
        description="The exam types this program reviews, with their usual transducers, typical depth, standard views and the findings a sonographer reads."
      />
      {query.isPending ? (
        <LoadingState label="Loading applications…" />
      ) : query.isError ? (
        <ErrorState error={query.error} onRetry={() => void query.refetch()} retrying={query.isFetching} />
      ) : applications.length === 0 ? (
        <EmptyState title="No applications yet">This program's catalogue is empty.</EmptyState>
      ) : (
        <>
          <p className="mb-4 text-sm text-slate-600">
            <span className="tabular-nums">{applications.length}</span> applications, <span className="tabular-nums">{active}</span> active.
          </p>
          <div className="space-y-4">
            {applications.map((a) => (
              <ApplicationCard key={a.id} application={a} />
            ))}
          </div>
        </>
      )}
    </div>
  );
}
