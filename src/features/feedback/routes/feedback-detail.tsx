// One exam's feedback: the result and its credit, every criterion with its anchor text and
// next steps, the reads per finding, the reviewers' comments, an adjudication note, the
// acknowledgement and the question thread.
import type { ReactNode } from "react";
import { useParams } from "react-router-dom";
import { CircleCheck } from "lucide-react";
import { Button } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { PageHeader } from "../../../components/ui/page-header";
import { ApplicationCautions } from "../../../components/ui/cautions";
import { LoadingState, QueryErrorState } from "../../../components/ui/states";
import { StatusTag } from "../../../components/ui/status-tag";
import { SETTING_LABELS } from "../../../lib/catalogue";
import { formatDateTime } from "../../../lib/format";
import { SOURCE_WORDS, noCreditReasons, useAcknowledge, useFeedback, type Feedback } from "../api/feedback";
import { CriteriaFeedback } from "../components/criteria-feedback";
import { FindingsComparison } from "../components/findings-comparison";
import { QuestionThread } from "../components/question-thread";

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

function Summary({ fb }: { fb: Feedback }) {
  return (
    <>
      <dl className="grid gap-x-6 gap-y-2 text-sm sm:grid-cols-[12rem_1fr]">
        <dt className="font-semibold text-slate-700">Application</dt>
        <dd className="text-ink-900">{fb.application.name}</dd>
        <dt className="font-semibold text-slate-700">Performed</dt>
        <dd className="tabular-nums text-ink-900">{formatDateTime(fb.performedAt)}</dd>
        <dt className="font-semibold text-slate-700">Setting</dt>
        <dd className="text-ink-900">{SETTING_LABELS[fb.setting]}</dd>
        <dt className="font-semibold text-slate-700">Reviewed</dt>
        <dd className="tabular-nums text-ink-900">{formatDateTime(fb.reviewedAt)}</dd>
        <dt className="font-semibold text-slate-700">Result from</dt>
        <dd className="text-ink-900">
          {SOURCE_WORDS[fb.source]}
          {fb.rubricVersion !== null ? <span className="text-slate-600"> · rubric version {fb.rubricVersion}</span> : null}
        </dd>
        <dt className="font-semibold text-slate-700">Credit toward credentialing</dt>
        <dd className="text-ink-900">
          {fb.credit ? (
            <StatusTag tone="good">Yes, this exam counts</StatusTag>
          ) : (
            <>
              <StatusTag tone="off">No, this exam does not count</StatusTag>
              <ul className="mt-1 list-disc pl-5 text-slate-700">
                {noCreditReasons(fb).map((r) => (
                  <li key={r}>{r}</li>
                ))}
              </ul>
            </>
          )}
        </dd>
      </dl>
      {fb.guide.cautions.length > 0 ? (
        <div className="mt-4">
          <ApplicationCautions cautions={fb.guide.cautions} />
        </div>
      ) : null}
    </>
  );
}

function Acknowledgement({ fb }: { fb: Feedback }) {
  const ack = useAcknowledge();
  if (fb.acknowledgedAt)
    return (
      <p role="status" className="inline-flex items-center gap-2 text-sm font-semibold text-sea-800">
        <CircleCheck aria-hidden="true" className="size-4" />
        Acknowledged {formatDateTime(fb.acknowledgedAt)}
      </p>
    );
  return (
    <div className="flex flex-col items-end gap-2">
      <Button onClick={() => ack.mutate(fb.examId)} busy={ack.isPending}>
        Acknowledge
      </Button>
      <FormMessage message={ack.isError ? ack.error.message : null} />
    </div>
  );
}

export default function FeedbackDetailPage() {
  const { examId = "" } = useParams();
  const query = useFeedback(examId);
  const fb = query.data;

  return (
    <div>
      <PageHeader
        eyebrow="Feedback"
        title={fb ? fb.code : "Feedback"}
        description={fb ? `${fb.application.name} · performed ${formatDateTime(fb.performedAt)}` : undefined}
        actions={fb ? <Acknowledgement fb={fb} /> : undefined}
      />
      {query.isPending ? (
        <LoadingState label="Loading the feedback…" />
      ) : query.isError ? (
        <QueryErrorState
          query={query}
          notFound={{ title: "No feedback here", message: "This is not a reviewed exam of yours, or its review is not final yet." }}
          back={{ to: "/feedback", label: "Back to all feedback" }}
        />
      ) : fb ? (
        <div className="space-y-6">
          <Section id="result-heading" title="Result">
            <Summary fb={fb} />
          </Section>
          <Section id="criteria-heading" title="Scores by criterion">
            <CriteriaFeedback criteria={fb.criteria} />
          </Section>
          <Section id="reads-heading" title="Your interpretation">
            <FindingsComparison findings={fb.findings} />
          </Section>
          <Section id="comments-heading" title="Reviewers' comments">
            {fb.comments.length === 0 ? (
              <p className="text-sm text-slate-600">The reviewers left no comments.</p>
            ) : (
              <ul className="space-y-3">
                {fb.comments.map((c, i) => (
                  <li key={i} className="rounded-md border border-slate-200 bg-paper-50 px-3 py-2 text-sm">
                    <p className="text-xs text-slate-600">
                      <span className="font-semibold text-ink-900">{c.reviewer ?? "Reviewer"}</span> ·{" "}
                      <span className="tabular-nums">{formatDateTime(c.at)}</span>
                    </p>
                    <p className="mt-1 whitespace-pre-line text-ink-900">{c.text}</p>
                  </li>
                ))}
              </ul>
            )}
            {fb.adjudicationNote ? (
              <div className="mt-4 rounded-md border-l-4 border-sea-600 bg-sea-50 px-3 py-2 text-sm">
                <p className="font-semibold text-sea-900">Adjudication note</p>
                <p className="mt-1 whitespace-pre-line text-ink-900">{fb.adjudicationNote}</p>
              </div>
            ) : null}
          </Section>
          <Section id="questions-heading" title="Questions">
            <QuestionThread examId={fb.examId} messages={fb.messages} />
          </Section>
        </div>
      ) : null}
    </div>
  );
}
