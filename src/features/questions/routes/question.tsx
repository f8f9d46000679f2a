// A sonographer's question about an exam I reviewed: the exam (blinded: never the
// sonographer), my review as I submitted it (levels, written feedback, reads), the final
// result, the thread oldest first and the answer box.
import type { ReactNode } from "react";
import { Link, useParams } from "react-router-dom";
import { EyeOff } from "lucide-react";
import { PageHeader } from "../../../components/ui/page-header";
import { EmptyState, ErrorState, LoadingState, QueryErrorState } from "../../../components/ui/states";
import { StatusTag } from "../../../components/ui/status-tag";
import { READ_LABELS, SETTING_LABELS } from "../../../lib/catalogue";
import { formatDateTime } from "../../../lib/format";
import { SOURCE_WORDS, useReviewedExam, useThread, type ReviewedExam, type ThreadMessage } from "../api/questions";
import { AnswerBox } from "../components/answer-box";

function Section({ id, title, children }: { id: string; title: string; children: ReactNode }) {
  return (
    <section aria-labelledby={id} className="rounded-lg border border-slate-200 bg-white p-5">
      <h2 id={id} className="mb-3 text-lg font-semibold text-ink-950">
        {title}
      </h2>
      {children}
    </section>
  );
}

function ExamSummary({ data }: { data: ReviewedExam }) {
  const { exam, final } = data;
  return (
    <dl className="grid gap-x-6 gap-y-2 text-sm sm:grid-cols-[12rem_1fr]">
      <dt className="font-semibold text-slate-700">Application</dt>
      <dd className="text-ink-900">{exam.application.name}</dd>
      <dt className="font-semibold text-slate-700">Performed</dt>
      <dd className="tabular-nums text-ink-900">{formatDateTime(exam.performedAt)}</dd>
      <dt className="font-semibold text-slate-700">Setting</dt>
      <dd className="text-ink-900">{SETTING_LABELS[exam.setting] ?? exam.setting}</dd>
      <dt className="font-semibold text-slate-700">Final result</dt>
      <dd className="text-ink-900">
        {final ? (
          <span className="flex flex-wrap items-center gap-2">
            {final.credit ? <StatusTag tone="good">Counts for credit</StatusTag> : <StatusTag tone="off">No credit</StatusTag>}
            <span className="text-slate-700">
              {SOURCE_WORDS[final.source]} · <span className="tabular-nums">{formatDateTime(final.decidedAt)}</span>
            </span>
          </span>
        ) : (
          <StatusTag tone="waiting">Not final yet</StatusTag>
        )}
      </dd>
    </dl>
  );
}

function MyReview({ review }: { review: NonNullable<ReviewedExam["myReview"]> }) {
  return (
    <div className="space-y-5">
      <p className="text-sm text-slate-600">
        Submitted <span className="tabular-nums">{formatDateTime(review.submittedAt)}</span>
      </p>
      <div>
        <h3 className="mb-2 text-sm font-semibold text-ink-900">Levels you chose</h3>
        {review.criteria.length === 0 ? (
          <p className="text-sm text-slate-600">The rubric of this review could not be found.</p>
        ) : (
          <table className="w-full max-w-2xl text-left text-sm">
            <caption className="sr-only">Your level for each criterion</caption>
            <thead className="border-b border-slate-200 text-xs uppercase tracking-wide text-slate-700">
              <tr>
                <th scope="col" className="py-1.5 pr-3 font-semibold">
                  Criterion
                </th>
                <th scope="col" className="py-1.5 font-semibold">
                  Your level
                </th>
              </tr>
            </thead>
            <tbody className="divide-y divide-slate-100">
              {review.criteria.map((c) => (
                <tr key={c.key}>
                  <th scope="row" className="py-1.5 pr-3 font-normal text-ink-900">
                    {c.label}
                  </th>
                  <td className="py-1.5 tabular-nums text-ink-900">
                    {c.levelLabel ?? (c.value === null ? <span className="text-slate-600">Not scored</span> : String(c.value))}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </div>
      <div>
        <h3 className="mb-2 text-sm font-semibold text-ink-900">Your written feedback</h3>
        {review.feedback.trim() ? (
          <p className="max-w-prose whitespace-pre-line rounded-md border border-slate-200 bg-paper-50 px-3 py-2 text-sm text-ink-900">{review.feedback}</p>
        ) : (
          <p className="text-sm text-slate-600">You wrote no feedback.</p>
        )}
      </div>
      <div>
        <h3 className="mb-2 text-sm font-semibold text-ink-900">Your reads</h3>
        {review.reads.length === 0 ? (
          <p className="text-sm text-slate-600">No findings were read.</p>
        ) : (
          <dl className="grid max-w-2xl gap-x-6 gap-y-1 text-sm sm:grid-cols-[18rem_1fr]">
            {review.reads.map((r) => (
              <div key={r.key} className="contents">
                <dt className="text-ink-900">{r.label}</dt>
                <dd className="font-semibold text-ink-900">{READ_LABELS[r.read] ?? r.read}</dd>
              </div>
            ))}
          </dl>
        )}
      </div>
    </div>
  );
}

function Messages({ messages }: { messages: ThreadMessage[] }) {
  if (messages.length === 0)
    return <EmptyState title="No questions yet">When the clinician asks about this exam's feedback, the question appears here.</EmptyState>;
  return (
    <ol className="space-y-3" aria-label="Messages, oldest first">
      {messages.map((m) => {
        const mine = m.author === "you";
        return (
          <li key={m.id} className={`rounded-md border px-3 py-2 text-sm ${mine ? "border-sea-200 bg-sea-50" : "border-slate-200 bg-paper-50"}`}>
            <p className="text-xs text-slate-600">
              <span className="font-semibold text-ink-900">{mine ? "You" : m.author}</span> ·{" "}
              <time dateTime={m.at} className="tabular-nums">
                {formatDateTime(m.at)}
              </time>
            </p>
            <p className="mt-1 whitespace-pre-line text-ink-900">{m.body}</p>
          </li>
        );
      })}
    </ol>
  );
}

function Thread({ examId }: { examId: string }) {
  const thread = useThread(examId);
  return (
    <div className="space-y-5">
      {thread.isPending ? (
        <LoadingState label="Loading the questions…" />
      ) : thread.isError ? (
        <ErrorState title="The questions could not be loaded" error={thread.error} onRetry={() => void thread.refetch()} retrying={thread.isFetching} />
      ) : (
        <Messages messages={thread.data.items} />
      )}
      <AnswerBox examId={examId} />
    </div>
  );
}

export default function QuestionPage() {
  const { examId = "" } = useParams();
  const query = useReviewedExam(examId);
  const data = query.data;

  return (
    <div>
      <PageHeader
        eyebrow="Questions"
        title={data ? `Question about exam ${data.exam.code}` : "Question about an exam"}
        description={data ? `${data.exam.application.name} · performed ${formatDateTime(data.exam.performedAt)}` : undefined}
        actions={
          <Link to="/reviews/questions" className="text-sm font-semibold text-sea-700 underline underline-offset-2">
            All questions
          </Link>
        }
      />
      {query.isPending ? (
        <LoadingState label="Loading the exam…" />
      ) : query.isError ? (
        <QueryErrorState
          query={query}
          notFound={{ title: "No exam here", message: "This is not an exam you reviewed, or it belongs to another program." }}
          back={{ to: "/reviews/questions", label: "Back to all questions" }}
        />
      ) : data ? (
        <div className="space-y-6">
          <p className="inline-flex items-center gap-2 text-sm text-slate-700">
            <EyeOff aria-hidden="true" className="size-4" />
            Blinded: the clinician appears as &ldquo;Clinician&rdquo;.
          </p>
          <Section id="exam-heading" title="Exam">
            <ExamSummary data={data} />
          </Section>
          <Section id="review-heading" title="Your review">
            {data.myReview ? (
              <MyReview review={data.myReview} />
            ) : (
              <p className="text-sm text-slate-600">You did not read this exam; as a QA lead you can still answer.</p>
            )}
          </Section>
          <Section id="thread-heading" title="Questions and answers">
            <Thread examId={data.exam.id} />
          </Section>
        </div>
      ) : null}
    </div>
  );
}
