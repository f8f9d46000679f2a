// Oversight → Calibration → New: name a set, pick its exams (each optionally with the QA
// lead's reference answer) and reviewers, and send the blinded calibration reads to the
// reviewers' queues. Server refusals appear beside the field they name, down to one
// criterion of one exam's reference answer.
import { useState, type FormEvent } from "react";
import { Link, useNavigate } from "react-router-dom";
import { Button, buttonClasses } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { PageHeader } from "../../../components/ui/page-header";
import { TextField } from "../../../components/ui/text-field";
import { errorMessage, fieldErrors, splitFieldMessage } from "../../../lib/api-errors";
import { useCreateCalibrationSet, type NewCalibrationSet } from "../api/calibration";
import { ExamPicker } from "../components/exam-picker";
import { ReferenceAnswers } from "../components/reference-answers";
import { draftHasValues, type ExamErrors, type ReferenceDraft } from "../components/reference-editor";
import { ReviewerPicker } from "../components/reviewer-picker";

type Field = "name" | "exams" | "reviewerIds";
type Errors = Partial<Record<Field | "form", string>> & { byExam?: Record<string, ExamErrors> };

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** The pasted lines, trimmed, without blanks. */
function pastedLines(text: string): string[] {
  return text
    .split(/\r?\n/)
    .map((l) => l.trim())
    .filter(Boolean);
}

const CHECK_EXAMS = "The set was not created: check the exams marked below.";

const isField = (f: string): f is Field => f === "name" || f === "exams" || f === "reviewerIds";

/**
 * Puts a 400 answer's messages on the fields they name: "name", "exams", "reviewerIds", or
 * inside one exam ("exams.1.examId", "exams.0.reference.scores.depth",
 * "exams.0.reference.reads.2.key", mapped back to the finding through the body sent).
 */
function serverErrors(error: unknown, sent: NewCalibrationSet): Errors {
  const out: Errors = {};
  const byExam: Record<string, ExamErrors> = {};
  const examErrors = (i: number) => {
    const examId = sent.exams[i]?.examId;
    if (!examId) return undefined;
    return (byExam[examId] ??= { scores: {}, reads: {} });
  };
  for (const [path, message] of Object.entries(fieldErrors(error))) {
    const parts = path.split(".");
    const m = /^exams\.(\d+)(?:\.(.*))?$/.exec(path);
    if (m) {
      const at = examErrors(Number(m[1]));
      const rest = (m[2] ?? "").split(".");
      if (!at) out.exams ??= message;
      else if (rest[0] === "reference" && rest[1] === "scores" && rest[2]) at.scores[rest[2]] ??= message;
      else if (rest[0] === "reference" && rest[1] === "reads" && rest[2] !== undefined) {
        const key = sent.exams[Number(m[1])].reference?.reads[Number(rest[2])]?.key;
        if (key) at.reads[key] ??= message;
        else at.reference ??= message;
      } else if (rest[0] === "reference") at.reference ??= message;
      else at.exam ??= message;
    } else if (isField(parts[0])) out[parts[0]] ??= message;
  }
  if (Object.keys(byExam).length > 0) {
    out.byExam = byExam;
    out.form = CHECK_EXAMS;
  }
  if (Object.keys(out).length > 0) return out;
  const message = errorMessage(error, "The set could not be created.");
  const { field, text } = splitFieldMessage(message);
  if (field && isField(field)) return { [field]: text };
  return { form: message };
}

/** A draft as the server takes it, or nothing when it gives nothing to compare. */
function referenceOf(draft: ReferenceDraft | undefined) {
  if (!draft || !draftHasValues(draft)) return undefined;
  return { scores: draft.scores, reads: Object.entries(draft.reads).map(([key, read]) => ({ key, read })) };
}

export default function NewCalibrationSetPage() {
  const navigate = useNavigate();
  const create = useCreateCalibrationSet();
  const [name, setName] = useState("");
  const [picked, setPicked] = useState<Set<string>>(new Set());
  const [pasted, setPasted] = useState("");
  const [reviewers, setReviewers] = useState<Set<string> | null>(null);
  const [drafts, setDrafts] = useState<Record<string, ReferenceDraft | undefined>>({});
  const [openIds, setOpenIds] = useState<Set<string>>(new Set());
  const [errors, setErrors] = useState<Errors>({});

  const lines = pastedLines(pasted);
  const examIds = [...new Set([...picked, ...lines])];
  // Messages about exams taken out of the set since go with them.
  const examErrors = Object.fromEntries(Object.entries(errors.byExam ?? {}).filter(([examId]) => examIds.includes(examId)));
  const formError = errors.form === CHECK_EXAMS && Object.keys(examErrors).length === 0 ? undefined : errors.form;

  function submit(e: FormEvent) {
    e.preventDefault();
    const found: Errors = {};
    const bad = lines.filter((l) => !UUID.test(l));
    if (!name.trim()) found.name = "Name the calibration set";
    if (bad.length) found.exams = `Not an exam id: ${bad.slice(0, 3).join(", ")}${bad.length > 3 ? ` and ${bad.length - 3} more` : ""}`;
    else if (examIds.length < 2) found.exams = "Pick at least two exams";
    if (reviewers && reviewers.size < 2) found.reviewerIds = "Pick at least two reviewers";
    setErrors(found);
    if (Object.keys(found).length > 0) return;
    const body: NewCalibrationSet = {
      name: name.trim(),
      exams: examIds.map((examId) => {
        const reference = referenceOf(drafts[examId]);
        return reference ? { examId, reference } : { examId };
      }),
      ...(reviewers ? { reviewerIds: [...reviewers] } : {}),
    };
    const withReference = body.exams.filter((e) => e.reference).length;
    create.mutate(body, {
      onSuccess: ({ id }) =>
        navigate(`/oversight/calibration/${id}`, {
          state: {
            notice: `Calibration set created: ${examIds.length} exams sent to the reviewers' queues${withReference ? `, ${withReference} with a reference answer` : ""}.`,
          },
        }),
      onError: (error) => {
        const found = serverErrors(error, body);
        setErrors(found);
        // Open the editors that hold a refused value, so the message is in view.
        const refused = Object.entries(found.byExam ?? {})
          .filter(([, e]) => e.reference || Object.keys(e.scores).length || Object.keys(e.reads).length)
          .map(([examId]) => examId);
        if (refused.length) setOpenIds((prev) => new Set([...prev, ...refused]));
      },
    });
  }

  return (
    <div>
      <PageHeader
        eyebrow="Oversight · Calibration"
        title="New calibration set"
        description="Each chosen reviewer gets every exam of the set in their queue as a blinded calibration read. Results fill in as the reads are submitted."
      />
      <form noValidate onSubmit={submit} className="max-w-3xl space-y-6">
        <TextField
          label="Name"
          hint="For example the month or the theme of the cases."
          value={name}
          maxLength={120}
          onChange={(e) => setName(e.target.value)}
          error={errors.name}
          className="max-w-md"
        />
        <ExamPicker
          picked={picked}
          onToggle={(examId, on) =>
            setPicked((prev) => {
              const next = new Set(prev);
              if (on) next.add(examId);
              else next.delete(examId);
              return next;
            })
          }
          pasted={pasted}
          onPastedChange={setPasted}
          error={errors.exams}
        />
        <p role="status" className="text-sm text-slate-700">
          {examIds.length === 1 ? "1 exam chosen" : `${examIds.length} exams chosen`}
        </p>
        <ReferenceAnswers
          examIds={examIds}
          drafts={drafts}
          openIds={openIds}
          errors={examErrors}
          onToggle={(examId, open) =>
            setOpenIds((prev) => {
              const next = new Set(prev);
              if (open) next.add(examId);
              else next.delete(examId);
              return next;
            })
          }
          onChange={(examId, next) => setDrafts((prev) => ({ ...prev, [examId]: next }))}
        />
        <ReviewerPicker
          chosen={reviewers}
          onToggle={(reviewerId, on, all) =>
            setReviewers((prev) => {
              const next = new Set(prev ?? all);
              if (on) next.add(reviewerId);
              else next.delete(reviewerId);
              // Everyone ticked again means "all reviewers", the server's default.
              return all.every((id) => next.has(id)) ? null : next;
            })
          }
          error={errors.reviewerIds}
        />
        <FormMessage message={formError} />
        <div className="flex gap-2 border-t border-slate-200 pt-4">
          <Button type="submit" busy={create.isPending}>
            Create and send
          </Button>
          <Link to="/oversight/calibration" className={buttonClasses("secondary")}>
            Cancel
          </Link>
        </div>
      </form>
    </div>
  );
}
