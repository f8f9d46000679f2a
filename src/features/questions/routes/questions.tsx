// Questions: the threads on exams I reviewed (a QA lead: every exam of the program), newest
// message first; a thread whose last word is the sonographer's is marked "Awaiting your
// answer" with an icon and the words, never by colour alone.
import { Link } from "react-router-dom";
import { MessageCircleCheck, MessageCircleQuestion } from "lucide-react";
import { PageHeader } from "../../../components/ui/page-header";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { formatDateTime } from "../../../lib/format";
import { formatCount } from "../../../lib/stat-format";
import { useQuestionList, type QuestionThread } from "../api/questions";

function State({ item }: { item: QuestionThread }) {
  return item.lastFromSonographer ? (
    <span className="inline-flex items-center gap-1 font-semibold text-sand-800">
      <MessageCircleQuestion aria-hidden="true" className="size-4" />
      Awaiting your answer
    </span>
  ) : (
    <span className="inline-flex items-center gap-1 text-slate-700">
      <MessageCircleCheck aria-hidden="true" className="size-4" />
      Answered
    </span>
  );
}

export default function QuestionsPage() {
  const list = useQuestionList();
  const items = list.data?.items ?? [];
  const waiting = items.filter((i) => i.lastFromSonographer).length;

  return (
    <div>
      <PageHeader
        title="Questions"
        description="Clinicians' questions about the feedback on exams you reviewed, newest message first. Open one to read it and answer."
      />
      {list.isPending ? (
        <LoadingState label="Loading the questions…" />
      ) : list.isError ? (
        <ErrorState error={list.error} onRetry={() => void list.refetch()} retrying={list.isFetching} />
      ) : items.length === 0 ? (
        <EmptyState title="No questions yet">
          When a clinician asks about the feedback on an exam you reviewed, it appears here and you get a notification.
        </EmptyState>
      ) : (
        <>
          <p className="mb-3 text-sm tabular-nums text-slate-700" aria-live="polite">
            {waiting === 0 ? "Every question has an answer." : `${formatCount(waiting)} awaiting your answer`} · {formatCount(items.length)}{" "}
            {items.length === 1 ? "thread" : "threads"}
          </p>
          <div className="overflow-x-auto rounded-lg border border-slate-200 bg-white">
            <table className="w-full text-left text-sm">
              <caption className="sr-only">Question threads, newest message first. Select an exam code to read the thread and answer.</caption>
              <thead className="border-b border-slate-200 bg-paper-200 text-xs uppercase tracking-wide text-slate-700">
                <tr>
                  <th scope="col" className="px-3 py-2 font-semibold">
                    Exam
                  </th>
                  <th scope="col" className="px-3 py-2 font-semibold">
                    Application
                  </th>
                  <th scope="col" className="px-3 py-2 font-semibold">
                    Last message
                  </th>
                  <th scope="col" className="px-3 py-2 text-right font-semibold">
                    Messages
                  </th>
                  <th scope="col" className="px-3 py-2 font-semibold">
                    State
                  </th>
                </tr>
              </thead>
              <tbody className="divide-y divide-slate-100">
                {items.map((item) => (
                  <tr key={item.examId} className={item.lastFromSonographer ? "bg-sand-50/60" : undefined}>
                    <td className="px-3 py-2">
                      <Link to={`/reviews/exams/${item.examId}`} className="font-mono font-semibold text-sea-700 underline-offset-2 hover:underline">
                        {item.code}
                      </Link>
                    </td>
                    <td className="px-3 py-2 text-ink-900">{item.application.name}</td>
                    <td className="whitespace-nowrap px-3 py-2 tabular-nums text-ink-900">{formatDateTime(item.lastMessageAt)}</td>
                    <td className="px-3 py-2 text-right tabular-nums text-ink-900">{formatCount(item.messages)}</td>
                    <td className="px-3 py-2">
                      <State item={item} />
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </>
      )}
    </div>
  );
}
