// Oversight → Adjudication: exams whose two independent reads differ beyond the rubric's
// tolerance, oldest due first. Each opens the side-by-side screen.
import { Link, useLocation } from "react-router-dom";
import { useQuery } from "@tanstack/react-query";
import { FormMessage } from "../../../components/ui/form-message";
import { PageHeader } from "../../../components/ui/page-header";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { StatusTag } from "../../../components/ui/status-tag";
import { SETTING_LABELS } from "../../../lib/catalogue";
import { membersQuery } from "../../../lib/members";
import { useAdjudications, type Adjudication } from "../api/oversight";
import { disagreementLabel } from "../components/disagreement-label";

export default function AdjudicationsPage() {
  const list = useAdjudications();
  const members = useQuery(membersQuery);
  const location = useLocation();
  const notice = (location.state as { notice?: string } | null)?.notice ?? null;
  const nameOf = (id: string | null) => (id ? (members.data?.members.find((m) => m.id === id)?.name ?? "A chosen reviewer") : null);

  return (
    <div>
      <PageHeader
        eyebrow="Oversight"
        title="Adjudication"
        description="Exams whose two independent reads differ by more than a criterion's tolerance. Compare the reads and set the final result, or hand the exam to a third reviewer."
      />
      {notice ? (
        <div className="mb-4">
          <FormMessage tone="success" message={notice} />
        </div>
      ) : null}
      {list.isPending ? (
        <LoadingState label="Loading exams waiting for adjudication…" />
      ) : list.isError ? (
        <ErrorState error={list.error} onRetry={() => void list.refetch()} retrying={list.isFetching} />
      ) : list.data.items.length === 0 ? (
        <EmptyState title="Nothing to adjudicate">Every double read so far agreed within tolerance, or has been settled.</EmptyState>
      ) : (
        <ul className="space-y-3">
          {list.data.items.map((item: Adjudication) => (
            <li key={item.assignmentId} className="rounded-lg border border-slate-200 bg-white p-4">
              <div className="flex flex-wrap items-center justify-between gap-3">
                <div>
                  <Link
                    to={`/oversight/adjudication/${item.examId}`}
                    className="font-mono text-lg font-semibold text-sea-700 underline-offset-2 hover:underline"
                  >
                    {item.examCode}
                  </Link>
                  <p className="text-sm text-slate-700">
                    {item.application.name} · {SETTING_LABELS[item.setting]}
                    {item.rubric ? ` · rubric version ${item.rubric.version}` : ""}
                  </p>
                </div>
                <div className="flex flex-wrap items-center gap-2">
                  <StatusTag tone="problem">
                    {item.disagreements.length} {item.disagreements.length === 1 ? "difference" : "differences"}
                  </StatusTag>
                  {item.assignedTo ? <StatusTag tone="waiting">Handed to {nameOf(item.assignedTo)}</StatusTag> : null}
                </div>
              </div>
              <p className="mt-2 text-sm text-ink-900">
                <span className="text-slate-600">Reads differ on: </span>
                {item.disagreements.map((d) => disagreementLabel(d, item)).join(", ") || "—"}
              </p>
              <p className="mt-1 text-sm text-slate-600">Reads by {item.reads.map((r) => r.reviewer).join(" and ") || "—"}</p>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
