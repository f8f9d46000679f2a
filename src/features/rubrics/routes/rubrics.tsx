// Setup → Rubrics: every rubric version with its status, criteria and the reviews made under
// it. A draft can be published; any version not yet archived can be archived.
import { useState } from "react";
import { Link, useLocation } from "react-router-dom";
import { buttonClasses, Button } from "../../../components/ui/button";
import { ConfirmDialog } from "../../../components/ui/dialog";
import { FormMessage } from "../../../components/ui/form-message";
import { PageHeader } from "../../../components/ui/page-header";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { StatusTag } from "../../../components/ui/status-tag";
import { formatDate } from "../../../lib/format";
import { formatCount } from "../../../lib/stat-format";
import { STATUS_WORDS, useRubricAction, useRubricList, type RubricListItem } from "../api/rubrics";

const TONE = { draft: "waiting", published: "good", archived: "off" } as const;

export default function RubricsPage() {
  const list = useRubricList();
  const action = useRubricAction();
  const location = useLocation();
  const notice = (location.state as { notice?: string } | null)?.notice ?? null;
  const [pending, setPending] = useState<{ rubric: RubricListItem; action: "publish" | "archive" } | null>(null);
  const rows = [...(list.data ?? [])].sort((a, b) => a.name.localeCompare(b.name) || b.version - a.version);

  return (
    <div>
      <PageHeader
        eyebrow="Setup"
        title="Rubrics"
        description="The criteria reviewers score. Saving a rubric that is in use creates its next version; past reviews keep the version they were made under, so editing never changes a past score."
        actions={
          <Link to="/setup/rubrics/new" className={buttonClasses("primary")}>
            New rubric
          </Link>
        }
      />
      {notice ? (
        <div className="mb-4">
          <FormMessage tone="success" message={notice} />
        </div>
      ) : null}
      {list.isPending ? (
        <LoadingState label="Loading rubrics…" />
      ) : list.isError ? (
        <ErrorState error={list.error} onRetry={() => void list.refetch()} retrying={list.isFetching} />
      ) : rows.length === 0 ? (
        <EmptyState
          title="No rubrics yet"
          action={
            <Link to="/setup/rubrics/new" className={buttonClasses("primary")}>
              New rubric
            </Link>
          }
        >
          Reviewers need a rubric in use before they can score.
        </EmptyState>
      ) : (
        <div className="overflow-x-auto rounded-lg border border-slate-200 bg-white">
          <table className="w-full text-left text-sm">
            <caption className="sr-only">Rubric versions</caption>
            <thead className="border-b border-slate-200 bg-paper-200 text-xs uppercase tracking-wide text-slate-700">
              <tr>
                {["Rubric", "Version", "Status", "Criteria", "Reviews made", "Published", ""].map((h, i) => (
                  <th key={i} scope="col" className="px-3 py-2 font-semibold">
                    {h || <span className="sr-only">Actions</span>}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody className="divide-y divide-slate-100">
              {rows.map((r) => (
                <tr key={r.id}>
                  <td className="px-3 py-2">
                    <Link to={`/setup/rubrics/${r.id}`} className="font-semibold text-sea-700 underline-offset-2 hover:underline">
                      {r.name}
                    </Link>
                  </td>
                  <td className="px-3 py-2 tabular-nums">{r.version}</td>
                  <td className="px-3 py-2">
                    <StatusTag tone={TONE[r.status]}>{STATUS_WORDS[r.status]}</StatusTag>
                  </td>
                  <td className="px-3 py-2 tabular-nums">{formatCount(r.criteriaCount)}</td>
                  <td className="px-3 py-2 tabular-nums">{formatCount(r.reviewCount)}</td>
                  <td className="px-3 py-2 tabular-nums">{formatDate(r.publishedAt)}</td>
                  <td className="px-3 py-2">
                    <div className="flex gap-2">
                      {r.status === "draft" ? (
                        <Button size="sm" variant="secondary" onClick={() => setPending({ rubric: r, action: "publish" })}>
                          Publish
                        </Button>
                      ) : null}
                      {r.status !== "archived" ? (
                        <Button size="sm" variant="ghost" onClick={() => setPending({ rubric: r, action: "archive" })}>
                          Archive
                        </Button>
                      ) : null}
                    </div>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      <ConfirmDialog
        open={!!pending}
        title={pending ? `${pending.action === "publish" ? "Publish" : "Archive"} ${pending.rubric.name}, version ${pending.rubric.version}?` : ""}
        confirmLabel={pending?.action === "publish" ? "Publish" : "Archive"}
        tone={pending?.action === "archive" ? "danger" : "primary"}
        busy={action.isPending}
        error={action.isError ? action.error.message : null}
        onClose={() => {
          setPending(null);
          action.reset();
        }}
        onConfirm={() => pending && action.mutate({ id: pending.rubric.id, action: pending.action }, { onSuccess: () => setPending(null) })}
      >
        {pending?.action === "publish"
          ? "New reviews will be scored under this version. The version now in use for this rubric is archived; reviews already made keep theirs."
          : "No new reviews will be scored under this version. Reviews already made keep it."}
      </ConfirmDialog>
    </div>
  );
}
