// The new-set form's optional reference answers: one row per chosen exam (code, application,
// what the answer covers so far) that opens the exam's editor. The exam's criteria and
// findings come from the server, so the answer is one a reviewer of the set could give.
import { useId } from "react";
import { useQuery } from "@tanstack/react-query";
import { CircleAlert } from "lucide-react";
import { Button } from "../../../components/ui/button";
import { ErrorState } from "../../../components/ui/states";
import { StatusTag } from "../../../components/ui/status-tag";
import { isApiError } from "../../../lib/api-errors";
import { referenceFormQuery, type ReferenceForm } from "../api/calibration";
import { draftHasValues, EMPTY_DRAFT, ReferenceEditor, type ExamErrors, type ReferenceDraft } from "./reference-editor";

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;

/** "4 of 7 criteria, 1 of 6 findings" */
function coverage(form: ReferenceForm, draft: ReferenceDraft): string {
  const scores = form.criteria.filter((c) => draft.scores[c.key] !== undefined).length;
  const reads = form.findings.filter((f) => draft.reads[f.key] !== undefined).length;
  const parts = [`${scores} of ${plural(form.criteria.length, "criterion", "criteria")}`];
  if (form.findings.length) parts.push(`${reads} of ${plural(form.findings.length, "finding", "findings")}`);
  return parts.join(", ");
}

function Problem({ id, message }: { id?: string; message: string }) {
  return (
    <p id={id} className="flex items-start gap-1 text-sm font-semibold text-coral-700">
      <CircleAlert aria-hidden="true" className="mt-0.5 size-4 shrink-0" />
      {message}
    </p>
  );
}

function ExamReference({
  examId,
  position,
  draft,
  open,
  errors,
  onToggle,
  onChange,
}: {
  examId: string;
  position: number;
  draft: ReferenceDraft | undefined;
  open: boolean;
  errors?: ExamErrors;
  onToggle: (open: boolean) => void;
  onChange: (next: ReferenceDraft | undefined) => void;
}) {
  const id = useId();
  const valid = UUID.test(examId);
  const form = useQuery({ ...referenceFormQuery(examId), enabled: valid });
  const hasValues = draftHasValues(draft);
  const headingId = `${id}-heading`;
  const panelId = `${id}-panel`;
  const problemId = `${id}-problem`;
  const data = form.data;

  let title = <span className="font-mono text-sm font-semibold text-ink-900">{examId}</span>;
  let body = null;
  if (!valid) {
    body = <Problem id={problemId} message="Not an exam id" />;
  } else if (form.isPending) {
    body = <p className="text-sm text-slate-600">Loading the exam…</p>;
  } else if (form.isError) {
    // The server's refusal of the same id (after "Create and send") says the same: show it once.
    body = isApiError(form.error, 404) ? (
      errors?.exam ? null : (
        <Problem id={problemId} message="No submitted exam with this id in the program" />
      )
    ) : isApiError(form.error, 409) ? (
      <Problem id={problemId} message={form.error.message} />
    ) : (
      <ErrorState error={form.error} onRetry={() => void form.refetch()} retrying={form.isFetching} />
    );
  } else if (data) {
    title = (
      <>
        <span className="font-mono text-sm font-semibold text-ink-900">{data.exam.code}</span>
        <span className="text-sm text-slate-700">{data.exam.application.name}</span>
      </>
    );
  }

  return (
    <li className="px-3 py-2" data-exam={examId}>
      <div className="flex flex-wrap items-center justify-between gap-x-3 gap-y-1">
        <h3 id={headingId} className="flex flex-wrap items-baseline gap-x-2">
          <span className="text-xs tabular-nums text-slate-600">{position}.</span>
          {title}
        </h3>
        {data ? (
          <div className="flex flex-wrap items-center gap-2">
            {hasValues ? <StatusTag tone="good">Reference: {coverage(data, draft!)}</StatusTag> : <StatusTag tone="off">No reference answer</StatusTag>}
            <Button size="sm" variant="secondary" aria-expanded={open} aria-controls={panelId} onClick={() => onToggle(!open)}>
              {open ? "Done" : hasValues ? "Edit reference answer" : "Add reference answer"}
              <span className="sr-only"> for {data.exam.code}</span>
            </Button>
            {hasValues ? (
              <Button
                size="sm"
                variant="ghost"
                onClick={() => {
                  onChange(undefined);
                  onToggle(false);
                }}
              >
                Remove<span className="sr-only"> the reference answer for {data.exam.code}</span>
              </Button>
            ) : null}
          </div>
        ) : null}
      </div>
      {body ? <div className="mt-1">{body}</div> : null}
      {errors?.exam ? (
        <div className="mt-1">
          <Problem message={errors.exam} />
        </div>
      ) : null}
      {errors?.reference ? (
        <div className="mt-1">
          <Problem message={errors.reference} />
        </div>
      ) : null}
      {data && open ? (
        <div id={panelId} role="region" aria-labelledby={headingId} className="mt-2 rounded-md border border-slate-200 bg-paper-50 p-3">
          <ReferenceEditor form={data} draft={draft ?? EMPTY_DRAFT} errors={errors} onChange={onChange} />
        </div>
      ) : null}
    </li>
  );
}

export function ReferenceAnswers({
  examIds,
  drafts,
  openIds,
  errors,
  onToggle,
  onChange,
}: {
  examIds: string[];
  drafts: Record<string, ReferenceDraft | undefined>;
  openIds: ReadonlySet<string>;
  errors: Record<string, ExamErrors>;
  onToggle: (examId: string, open: boolean) => void;
  onChange: (examId: string, next: ReferenceDraft | undefined) => void;
}) {
  return (
    <section aria-labelledby="reference-answers-heading" className="space-y-2">
      <div>
        <h2 id="reference-answers-heading" className="text-sm font-semibold text-ink-900">
          Reference answers <span className="font-normal text-slate-600">(optional)</span>
        </h2>
        <p className="text-sm text-slate-600">
          Your own answer for an exam. Each reviewer&apos;s calibration read is compared with it, value by value. Reviewers never see it.
        </p>
      </div>
      {examIds.length === 0 ? (
        <p className="rounded-lg border border-dashed border-slate-300 px-3 py-3 text-sm text-slate-600">
          Pick exams above to give a reference answer for them.
        </p>
      ) : (
        <ol className="divide-y divide-slate-100 rounded-lg border border-slate-200 bg-white">
          {examIds.map((examId, i) => (
            <ExamReference
              key={examId}
              examId={examId}
              position={i + 1}
              draft={drafts[examId]}
              open={openIds.has(examId)}
              errors={errors[examId]}
              onToggle={(open) => onToggle(examId, open)}
              onChange={(next) => onChange(examId, next)}
            />
          ))}
        </ol>
      )}
    </section>
  );
}
