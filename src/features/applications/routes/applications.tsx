// Setup → Applications: the catalogue of exam types this program reviews, in the version in
// use. A QA lead or admin adds applications and edits them (each save is a new version);
// typical depth is a starting value for hints, not a rule.
import { Link } from "react-router-dom";
import { useQuery } from "@tanstack/react-query";
import { Plus } from "lucide-react";
import { buttonClasses } from "../../../components/ui/button";
import { hasAnyRole, sessionQuery } from "../../../lib/session";
import { PageHeader } from "../../../components/ui/page-header";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { useApplications } from "../api/applications";
import { ApplicationCard } from "../components/application-card";

export default function ApplicationsPage() {
  const query = useApplications();
  const session = useQuery(sessionQuery);
  const mayEdit = hasAnyRole(session.data, ["qa_lead", "admin"]);
  const applications = query.data?.applications ?? [];
  const active = applications.filter((a) => a.active).length;
  return (
    <div>
      <PageHeader
        eyebrow="Setup"
        title="Applications"
        description="The exam types this program reviews: usual transducers, presets, typical depth, orientation convention, views, the findings a clinician reads, and cautions. The program owns this catalogue; the built-in one was its starting copy."
        actions={
          mayEdit ? (
            <Link to="/setup/applications/new" className={buttonClasses("primary")}>
              <Plus aria-hidden="true" className="size-4" />
              Add application
            </Link>
          ) : undefined
        }
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
              <ApplicationCard key={a.id} application={a} mayEdit={mayEdit} />
            ))}
          </div>
        </>
      )}
    </div>
  );
}
