// Oversight → Follow-ups: clinically significant disagreements on clinical exams (for
// example a possibly missed finding that may need a patient callback), by status.
import { useState } from "react";
import { Link, useSearchParams } from "react-router-dom";
import { useQuery } from "@tanstack/react-query";
import { PageHeader } from "../../../components/ui/page-header";
import { SelectField } from "../../../components/ui/select-field";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { StatusTag } from "../../../components/ui/status-tag";
import { Button } from "../../../components/ui/button";
import { formatDateTime } from "../../../lib/format";
import { FOLLOW_UP_WORDS, followUpsQuery, type FollowUp, type FollowUpStatus } from "../api/oversight";
import { FollowUpDialog } from "../components/follow-up-dialog";
import { OUTCOME_LABELS } from "../../../../shared/schemas/follow-ups";

const STATUS_TONE = { open: "problem", in_progress: "waiting", closed: "off" } as const;
const FILTERS = ["open", "in_progress", "closed", "all"] as const;
type Filter = (typeof FILTERS)[number];

export default function FollowUpsPage() {
  const [params, setParams] = useSearchParams();
  const raw = params.get("status");
  const status: Filter = (FILTERS as readonly string[]).includes(raw ?? "") ? (raw as Filter) : "all";
  const list = useQuery(followUpsQuery(status));
  const [editing, setEditing] = useState<FollowUp | null>(null);

  return (
    <div>
      <PageHeader
        eyebrow="Oversight"
        title="Follow-ups"
        description="Clinical exams a reviewer flagged as needing follow-up now, and those where the clinician's interpretation and the final read point opposite ways. Decide whether the patient needs a callback, and close each with what was done."
      />
      <form
        role="search"
        aria-label="Filter follow-ups"
        onSubmit={(e) => e.preventDefault()}
        className="mb-4 flex flex-wrap items-end gap-3 rounded-lg border border-slate-200 bg-white p-4"
      >
        <SelectField
          label="Status"
          compact
          className="w-44"
          value={status}
          onChange={(e) => setParams(e.target.value === "all" ? new URLSearchParams() : new URLSearchParams({ status: e.target.value }))}
        >
          <option value="all">All</option>
          <option value="open">Open</option>
          <option value="in_progress">In progress</option>
          <option value="closed">Closed</option>
        </SelectField>
      </form>
      {list.isPending ? (
        <LoadingState label="Loading follow-ups…" />
      ) : list.isError ? (
        <ErrorState error={list.error} onRetry={() => void list.refetch()} retrying={list.isFetching} />
      ) : list.data.items.length === 0 ? (
        <EmptyState title={status === "all" ? "No follow-ups" : `No ${FOLLOW_UP_WORDS[status as FollowUpStatus].toLowerCase()} follow-ups`}>
          A follow-up appears when a reviewer flags a clinical exam as needing follow-up now, or when a final read on a clinical exam disagrees with the
          clinician&apos;s interpretation.
        </EmptyState>
      ) : (
        <div className="overflow-x-auto rounded-lg border border-slate-200 bg-white">
          <table className="w-full text-left text-sm">
            <caption className="sr-only">Follow-ups of clinically significant disagreements</caption>
            <thead className="border-b border-slate-200 bg-paper-200 text-xs uppercase tracking-wide text-slate-700">
              <tr>
                {["Exam", "Clinician", "Performed", "Reason", "Status", "Note", ""].map((h, i) => (
                  <th key={i} scope="col" className="px-3 py-2 font-semibold">
                    {h || <span className="sr-only">Actions</span>}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody className="divide-y divide-slate-100">
              {list.data.items.map((f) => (
                <tr key={f.id} className="align-top">
                  <td className="px-3 py-2">
                    <Link to={`/exams/${f.examId}`} className="font-mono font-semibold text-sea-700 underline-offset-2 hover:underline">
                      {f.examCode}
                    </Link>
                    <span className="block text-xs text-slate-600">{f.application}</span>
                  </td>
                  <td className="px-3 py-2 text-ink-900">{f.sonographer}</td>
                  <td className="whitespace-nowrap px-3 py-2 tabular-nums text-ink-900">{formatDateTime(f.performedAt)}</td>
                  <td className="max-w-md whitespace-pre-line px-3 py-2 text-ink-900">{f.reason}</td>
                  <td className="px-3 py-2">
                    <div className="flex flex-wrap gap-1">
                      <StatusTag tone={STATUS_TONE[f.status]}>{FOLLOW_UP_WORDS[f.status]}</StatusTag>
                      {f.urgent && f.status !== "closed" ? <StatusTag tone="problem">Urgent</StatusTag> : null}
                      {f.overdue ? <StatusTag tone="problem">Overdue</StatusTag> : null}
                    </div>
                    {f.status !== "closed" ? <span className="mt-1 block text-xs text-slate-600">Due {formatDateTime(f.dueAt)}</span> : null}
                    {f.outcome ? <span className="mt-1 block text-xs font-semibold text-ink-900">{OUTCOME_LABELS[f.outcome]}</span> : null}
                    {f.actedAt && f.status === "closed" ? (
                      <span className="block text-xs text-slate-600">
                        Acted on {formatDateTime(f.actedAt)}
                        {f.actedBy ? ` by ${f.actedBy}` : ""}
                      </span>
                    ) : null}
                    {f.closedAt ? (
                      <span className="mt-1 block text-xs text-slate-600">
                        Closed {formatDateTime(f.closedAt)}
                        {f.closedBy ? ` by ${f.closedBy}` : ""}
                      </span>
                    ) : null}
                  </td>
                  <td className="max-w-xs whitespace-pre-line px-3 py-2 text-ink-900">{f.note || <span className="text-slate-500">—</span>}</td>
                  <td className="px-3 py-2">
                    <Button size="sm" variant="secondary" onClick={() => setEditing(f)} aria-label={`Update follow-up on ${f.examCode}`}>
                      Update
                    </Button>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      <FollowUpDialog followUp={editing} onClose={() => setEditing(null)} />
    </div>
  );
}
