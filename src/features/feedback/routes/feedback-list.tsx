// Feedback: the sonographer's reviewed exams, newest first, with unread ones marked by an
// icon and a word. The application filter lives in the address so Back keeps it.
import { Link, useSearchParams } from "react-router-dom";
import { useQuery } from "@tanstack/react-query";
import { CircleCheck, Mail } from "lucide-react";
import { Button } from "../../../components/ui/button";
import { PageHeader } from "../../../components/ui/page-header";
import { SelectField } from "../../../components/ui/select-field";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { StatusTag } from "../../../components/ui/status-tag";
import { SETTING_LABELS, applicationsQuery } from "../../../lib/catalogue";
import { formatDate, formatDateTime } from "../../../lib/format";
import { useFeedbackList } from "../api/feedback";

export default function FeedbackListPage() {
  const [params, setParams] = useSearchParams();
  const application = params.get("application") ?? "";
  const list = useFeedbackList();
  const apps = useQuery(applicationsQuery);

  const items = (list.data?.items ?? []).filter((i) => !application || i.application.code === application);
  const unread = (list.data?.items ?? []).filter((i) => i.unread).length;
  const setApplication = (code: string) => setParams(code ? new URLSearchParams({ application: code }) : new URLSearchParams());

  return (
    <div>
      <PageHeader title="Feedback" description="What the reviewers found in your reviewed exams, criterion by criterion, with next steps. Newest first." />
      <form
        role="search"
        aria-label="Filter feedback"
        onSubmit={(e) => e.preventDefault()}
        className="mb-4 flex flex-wrap items-end gap-3 rounded-lg border border-slate-200 bg-white p-4"
      >
        <SelectField label="Application" compact className="w-56" value={application} onChange={(e) => setApplication(e.target.value)}>
          <option value="">All applications</option>
          {(apps.data?.applications ?? []).map((a) => (
            <option key={a.code} value={a.code}>
              {a.name}
            </option>
          ))}
        </SelectField>
        {list.data ? (
          <p className="pb-1 text-sm tabular-nums text-slate-600" aria-live="polite">
            {unread === 0 ? "Everything read" : `${unread} unread`}
          </p>
        ) : null}
      </form>

      {list.isPending ? (
        <LoadingState label="Loading your feedback…" />
      ) : list.isError ? (
        <ErrorState error={list.error} onRetry={() => void list.refetch()} retrying={list.isFetching} />
      ) : items.length === 0 ? (
        application ? (
          <EmptyState
            title="No feedback for this application yet"
            action={
              <Button variant="secondary" onClick={() => setApplication("")}>
                Show all applications
              </Button>
            }
          />
        ) : (
          <EmptyState title="No feedback yet">
            Once a reviewer has scored one of your submitted exams, the feedback appears here and you get a notification.
          </EmptyState>
        )
      ) : (
        <div className="overflow-x-auto rounded-lg border border-slate-200 bg-white">
          <table className="w-full text-left text-sm">
            <caption className="sr-only">Your reviewed exams, newest first. Select a code to read the feedback.</caption>
            <thead className="border-b border-slate-200 bg-paper-200 text-xs uppercase tracking-wide text-slate-700">
              <tr>
                <th scope="col" className="px-3 py-2 font-semibold">
                  Code
                </th>
                <th scope="col" className="px-3 py-2 font-semibold">
                  Application
                </th>
                <th scope="col" className="px-3 py-2 font-semibold">
                  Performed
                </th>
                <th scope="col" className="px-3 py-2 font-semibold">
                  Reviewed
                </th>
                <th scope="col" className="px-3 py-2 font-semibold">
                  Credit
                </th>
                <th scope="col" className="px-3 py-2 font-semibold">
                  State
                </th>
              </tr>
            </thead>
            <tbody className="divide-y divide-slate-100">
              {items.map((item) => (
                <tr key={item.examId} className={item.unread ? "bg-sea-50/60" : undefined}>
                  <td className="px-3 py-2">
                    <Link to={`/feedback/${item.examId}`} className="font-mono font-semibold text-sea-700 underline-offset-2 hover:underline">
                      {item.code}
                    </Link>
                  </td>
                  <td className="px-3 py-2 text-ink-900">
                    {item.application.name}
                    <span className="block text-xs text-slate-600">{SETTING_LABELS[item.setting]}</span>
                  </td>
                  <td className="whitespace-nowrap px-3 py-2 tabular-nums text-ink-900">{formatDate(item.performedAt)}</td>
                  <td className="whitespace-nowrap px-3 py-2 tabular-nums text-ink-900">{formatDateTime(item.reviewedAt)}</td>
                  <td className="px-3 py-2">{item.credit ? <StatusTag tone="good">Counts</StatusTag> : <StatusTag tone="off">No credit</StatusTag>}</td>
                  <td className="px-3 py-2">
                    {item.unread ? (
                      <span className="inline-flex items-center gap-1 font-semibold text-sea-800">
                        <Mail aria-hidden="true" className="size-4" />
                        Unread
                      </span>
                    ) : item.acknowledgedAt ? (
                      <span className="inline-flex items-center gap-1 text-slate-700">
                        <CircleCheck aria-hidden="true" className="size-4" />
                        Acknowledged
                      </span>
                    ) : (
                      <span className="text-slate-700">Read</span>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}
