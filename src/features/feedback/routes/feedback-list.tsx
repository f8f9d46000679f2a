// Feedback: a timeline of the sonographer's reviewed exams, newest review first and grouped
// by month, with unread ones marked by an icon and a word, credit and acknowledgement shown
// on every entry, and filters (application, unread only, not yet acknowledged, credited or
// not) kept in the address so Back and a shared link keep them.
import { Fragment } from "react";
import { Link } from "react-router-dom";
import { useQuery } from "@tanstack/react-query";
import { CircleCheck, CircleDashed, Mail, MailOpen, MessageSquare } from "lucide-react";
import { useSearchState } from "../../../lib/use-search-state";
import { Button } from "../../../components/ui/button";
import { PageHeader } from "../../../components/ui/page-header";
import { SelectField } from "../../../components/ui/select-field";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { StatusTag } from "../../../components/ui/status-tag";
import { SETTING_LABELS, applicationsQuery } from "../../../lib/catalogue";
import { formatDate, formatDateTime } from "../../../lib/format";
import { useFeedbackList, type FeedbackListItem } from "../api/feedback";

type Credit = "" | "yes" | "no";
const FILTER_KEYS = ["application", "unread", "unacknowledged", "credit"] as const;

const monthOf = (iso: string) => new Intl.DateTimeFormat(undefined, { month: "long", year: "numeric" }).format(new Date(iso));

/** The filters as the address holds them. */
function readFilters(params: URLSearchParams) {
  const credit = params.get("credit");
  return {
    application: params.get("application") ?? "",
    unread: params.get("unread") === "1",
    unacknowledged: params.get("unacknowledged") === "1",
    credit: (credit === "yes" || credit === "no" ? credit : "") as Credit,
  };
}

function matches(item: FeedbackListItem, f: ReturnType<typeof readFilters>): boolean {
  if (f.application && item.application.code !== f.application) return false;
  if (f.unread && !item.unread) return false;
  if (f.unacknowledged && item.acknowledgedAt) return false;
  if (f.credit === "yes" && !item.credit) return false;
  if (f.credit === "no" && item.credit) return false;
  return true;
}

function Checkbox({ label, checked, onChange }: { label: string; checked: boolean; onChange: (v: boolean) => void }) {
  return (
    <label className="inline-flex items-center gap-2 pb-1.5 text-sm text-ink-900">
      <input type="checkbox" checked={checked} onChange={(e) => onChange(e.target.checked)} className="size-4 accent-sea-600" />
      {label}
    </label>
  );
}

function Entry({ item }: { item: FeedbackListItem }) {
  const firstComment = item.comments.find((c) => c.text.trim())?.text;
  return (
    <tr className={item.unread ? "bg-sea-50/60" : undefined}>
      <td className="w-8 py-2 pr-0 pl-3 align-top">
        {item.unread ? (
          <Mail aria-hidden="true" className="mt-0.5 size-4 text-sea-700" />
        ) : (
          <MailOpen aria-hidden="true" className="mt-0.5 size-4 text-slate-500" />
        )}
      </td>
      <td className="px-3 py-2 align-top">
        <Link to={`/feedback/${item.examId}`} className="font-mono font-semibold text-sea-700 underline-offset-2 hover:underline">
          {item.code}
        </Link>
        <span className="block text-ink-900">
          {item.application.name}
          <span className="text-xs text-slate-600"> · {SETTING_LABELS[item.setting]}</span>
        </span>
        {firstComment ? <span className="mt-0.5 line-clamp-1 block max-w-md text-xs text-slate-600">&ldquo;{firstComment}&rdquo;</span> : null}
      </td>
      <td className="whitespace-nowrap px-3 py-2 align-top tabular-nums text-ink-900">{formatDate(item.performedAt)}</td>
      <td className="whitespace-nowrap px-3 py-2 align-top tabular-nums text-ink-900">{formatDateTime(item.reviewedAt)}</td>
      <td className="px-3 py-2 align-top">{item.credit ? <StatusTag tone="good">Counts</StatusTag> : <StatusTag tone="off">No credit</StatusTag>}</td>
      <td className="px-3 py-2 align-top">
        <span className="flex flex-col gap-1 text-sm">
          {item.unread ? (
            <span className="inline-flex items-center gap-1 font-semibold text-sea-800">
              <Mail aria-hidden="true" className="size-4" />
              Unread
            </span>
          ) : (
            <span className="inline-flex items-center gap-1 text-slate-700">
              <MailOpen aria-hidden="true" className="size-4" />
              Read
            </span>
          )}
          {item.acknowledgedAt ? (
            <span className="inline-flex items-center gap-1 text-slate-700" title={`Acknowledged ${formatDateTime(item.acknowledgedAt)}`}>
              <CircleCheck aria-hidden="true" className="size-4" />
              Acknowledged
            </span>
          ) : (
            <span className="inline-flex items-center gap-1 text-sand-800">
              <CircleDashed aria-hidden="true" className="size-4" />
              Not yet acknowledged
            </span>
          )}
          {item.messages.length ? (
            <span className="inline-flex items-center gap-1 text-slate-700">
              <MessageSquare aria-hidden="true" className="size-4" />
              {item.messages.length} {item.messages.length === 1 ? "message" : "messages"}
            </span>
          ) : null}
        </span>
      </td>
    </tr>
  );
}

export default function FeedbackListPage() {
  const [params, update] = useSearchState();
  const filters = readFilters(params);
  const list = useFeedbackList();
  const apps = useQuery(applicationsQuery);

  const all = list.data?.items ?? [];
  // Newest review first, whatever order the server sends.
  const items = all.filter((i) => matches(i, filters)).sort((a, b) => b.reviewedAt.localeCompare(a.reviewedAt));
  const unread = all.filter((i) => i.unread).length;
  const unacknowledged = all.filter((i) => !i.acknowledgedAt).length;
  const filtered = FILTER_KEYS.some((k) => params.get(k));
  const months: { month: string; items: FeedbackListItem[] }[] = [];
  for (const item of items) {
    const month = monthOf(item.reviewedAt);
    if (months.at(-1)?.month === month) months.at(-1)!.items.push(item);
    else months.push({ month, items: [item] });
  }

  const set = (key: (typeof FILTER_KEYS)[number], value: string) => update({ [key]: value });
  const clear = () => update(Object.fromEntries(FILTER_KEYS.map((k) => [k, null])));

  return (
    <div>
      <PageHeader
        title="Feedback"
        description="What the reviewers found in your reviewed exams, criterion by criterion, with next steps. Newest review first."
        actions={
          <Link to="/progress" className="text-sm font-semibold text-sea-700 underline underline-offset-2">
            See your progress
          </Link>
        }
      />
      <form
        role="search"
        aria-label="Filter feedback"
        onSubmit={(e) => e.preventDefault()}
        className="mb-4 flex flex-wrap items-end gap-x-5 gap-y-3 rounded-lg border border-slate-200 bg-white p-4"
      >
        <SelectField label="Application" compact className="w-56" value={filters.application} onChange={(e) => set("application", e.target.value)}>
          <option value="">All applications</option>
          {(apps.data?.applications ?? []).map((a) => (
            <option key={a.code} value={a.code}>
              {a.name}
            </option>
          ))}
        </SelectField>
        <SelectField label="Credit" compact className="w-44" value={filters.credit} onChange={(e) => set("credit", e.target.value)}>
          <option value="">Any</option>
          <option value="yes">Credited</option>
          <option value="no">Not credited</option>
        </SelectField>
        <Checkbox label="Unread only" checked={filters.unread} onChange={(v) => set("unread", v ? "1" : "")} />
        <Checkbox label="Not yet acknowledged" checked={filters.unacknowledged} onChange={(v) => set("unacknowledged", v ? "1" : "")} />
        {filtered ? (
          <Button variant="ghost" size="sm" className="mb-1" onClick={clear}>
            Clear filters
          </Button>
        ) : null}
        {list.data ? (
          <p className="ml-auto pb-1 text-sm tabular-nums text-slate-600" aria-live="polite">
            {unread === 0 ? "Everything read" : `${unread} unread`} · {unacknowledged === 0 ? "all acknowledged" : `${unacknowledged} not yet acknowledged`}
            {filtered ? ` · showing ${items.length} of ${all.length}` : ""}
          </p>
        ) : null}
      </form>

      {list.isPending ? (
        <LoadingState label="Loading your feedback…" />
      ) : list.isError ? (
        <ErrorState error={list.error} onRetry={() => void list.refetch()} retrying={list.isFetching} />
      ) : items.length === 0 ? (
        filtered ? (
          <EmptyState
            title="No feedback matches these filters"
            action={
              <Button variant="secondary" onClick={clear}>
                Clear filters
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
            <caption className="sr-only">Your reviewed exams by month of review, newest first. Select a code to read the feedback.</caption>
            <thead className="border-b border-slate-200 bg-paper-200 text-xs uppercase tracking-wide text-slate-700">
              <tr>
                <th scope="col" className="w-8 py-2 pr-0 pl-3">
                  <span className="sr-only">Read or unread</span>
                </th>
                <th scope="col" className="px-3 py-2 font-semibold">
                  Exam
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
            {months.map((m) => (
              <Fragment key={m.month}>
                <tbody>
                  <tr className="border-y border-slate-200 bg-paper-100">
                    <th scope="colgroup" colSpan={6} className="px-3 py-1.5 text-xs font-semibold uppercase tracking-wide text-slate-700">
                      {m.month} <span className="font-normal normal-case tracking-normal text-slate-600">· {m.items.length} reviewed</span>
                    </th>
                  </tr>
                </tbody>
                <tbody className="divide-y divide-slate-100">
                  {m.items.map((item) => (
                    <Entry key={item.examId} item={item} />
                  ))}
                </tbody>
              </Fragment>
            ))}
          </table>
        </div>
      )}
    </div>
  );
}
