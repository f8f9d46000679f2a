// Setup → Applications → one application: its form, and its versions. Saving a changed
// application publishes its next version and archives this one; exams recorded under a
// version keep its views and findings. An archived version is shown read-only.
import { Link, useLocation, useNavigate, useParams } from "react-router-dom";
import { useQuery } from "@tanstack/react-query";
import type { Application } from "../../../../shared/schemas/applications";
import { FormMessage } from "../../../components/ui/form-message";
import { PageHeader } from "../../../components/ui/page-header";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { StatusTag } from "../../../components/ui/status-tag";
import { formatDateTime } from "../../../lib/format";
import { hasAnyRole, sessionQuery } from "../../../lib/session";
import { applicationHistoryQuery, useApplicationVersion, useSaveApplication } from "../api/applications";
import { ApplicationForm } from "../components/application-form";

function VersionHistory({ application }: { application: Application }) {
  const history = useQuery(applicationHistoryQuery(application.id));
  return (
    <section aria-labelledby="versions-heading" className="rounded-lg border border-slate-200 bg-white p-5">
      <h2 id="versions-heading" className="text-lg font-semibold text-ink-950">
        Versions
      </h2>
      {history.isPending ? (
        <LoadingState label="Loading the versions…" />
      ) : history.isError ? (
        <ErrorState error={history.error} onRetry={() => void history.refetch()} retrying={history.isFetching} />
      ) : history.data.length === 0 ? (
        <EmptyState title="No versions">This application has no versions.</EmptyState>
      ) : (
        <ol className="mt-3 divide-y divide-slate-200 text-sm">
          {history.data.map((v) => (
            <li key={v.id} className="flex flex-wrap items-center gap-x-3 gap-y-1 py-2">
              {v.id === application.id ? (
                <span className="font-semibold text-ink-950">Version {v.version}</span>
              ) : (
                <Link to={`/setup/applications/${v.id}`} className="font-semibold text-sea-700 underline-offset-2 hover:underline">
                  Version {v.version}
                </Link>
              )}
              <StatusTag tone={v.status === "published" ? "good" : "off"}>{v.status === "published" ? "In use" : "Archived"}</StatusTag>
              <span className="tabular-nums text-slate-700">
                {formatDateTime(v.publishedAt)}
                {v.createdBy ? ` · ${v.createdBy}` : " · built-in starting copy"}
              </span>
              <span className="tabular-nums text-slate-700">
                {v.examCount} {v.examCount === 1 ? "exam" : "exams"} recorded under it
              </span>
            </li>
          ))}
        </ol>
      )}
    </section>
  );
}

export default function ApplicationEditorPage() {
  const { id = "" } = useParams();
  const isNew = !id;
  const navigate = useNavigate();
  const location = useLocation();
  const notice = (location.state as { notice?: string } | null)?.notice ?? null;
  const query = useApplicationVersion(id);
  const session = useQuery(sessionQuery);
  const mayEdit = hasAnyRole(session.data, ["qa_lead", "admin"]);
  const save = useSaveApplication();
  const application = isNew ? null : query.data?.application;

  const onSubmit = async (body: Parameters<typeof save.mutateAsync>[0]["body"]) => {
    const saved = await save.mutateAsync({ id: application?.id, body });
    const message = !application
      ? `${saved.name} added as version 1.`
      : saved.id === application.id
        ? "Nothing changed, so no new version was made."
        : `Saved as version ${saved.version}, now in use. Version ${application.version} is archived; exams recorded under it keep it.`;
    navigate(`/setup/applications/${saved.id}`, { replace: !!application && saved.id === application.id, state: { notice: message } });
  };

  return (
    <div>
      <PageHeader
        eyebrow="Setup · Applications"
        title={isNew ? "New application" : application ? `${application.name}, version ${application.version}` : "Application"}
        actions={
          application ? (
            <StatusTag tone={application.status === "published" ? "good" : "off"}>{application.status === "published" ? "In use" : "Archived"}</StatusTag>
          ) : undefined
        }
      />
      {notice ? (
        <div className="mb-4">
          <FormMessage tone="success" message={notice} />
        </div>
      ) : null}
      {!isNew && query.isPending ? (
        <LoadingState label="Loading the application…" />
      ) : !isNew && query.isError ? (
        <ErrorState error={query.error} onRetry={() => void query.refetch()} retrying={query.isFetching} />
      ) : (
        <div className="space-y-6">
          <div className="rounded-lg border border-sand-200 bg-sand-50 px-4 py-3 text-sm text-ink-900">
            {!application
              ? "A new application starts as version 1. Its code names it in exports and never changes."
              : application.status === "archived"
                ? "This version is archived and cannot change. Exams recorded under it keep its views and findings."
                : `Saving a change makes version ${application.version + 1} the one new exams are recorded under and archives this one; exams already recorded keep version ${application.version}.`}
            {!mayEdit ? " Only a QA lead or an admin can change the catalogue." : ""}
          </div>
          <ApplicationForm
            key={application?.id ?? "new"}
            application={application ?? null}
            readOnly={!mayEdit || application?.status === "archived"}
            busy={save.isPending}
            error={save.error}
            onSubmit={onSubmit}
            onCancel={() => navigate("/setup/applications")}
          />
          {application ? <VersionHistory application={application} /> : null}
        </div>
      )}
    </div>
  );
}
