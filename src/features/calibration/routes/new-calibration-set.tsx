// Oversight → Calibration → New: name a set, pick its exams and reviewers, and send the
// blinded calibration reads to the reviewers' queues.
import { useState, type FormEvent } from "react";
import { Link, useNavigate } from "react-router-dom";
import { Button, buttonClasses } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { PageHeader } from "../../../components/ui/page-header";
import { TextField } from "../../../components/ui/text-field";
import { fieldErrors } from "../../../lib/api-client";
import { useCreateCalibrationSet } from "../api/calibration";
import { ExamPicker } from "../components/exam-picker";
import { ReviewerPicker } from "../components/reviewer-picker";
import { splitFieldMessage } from "../components/stat-format";

type Field = "name" | "exams" | "reviewerIds";
type Errors = Partial<Record<Field | "form", string>>;

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** The pasted lines, trimmed, without blanks. */
function pastedLines(text: string): string[] {
  return text
    .split(/\r?\n/)
    .map((l) => l.trim())
    .filter(Boolean);
}

/** Puts a 400 answer's message on the field it names ("exams: Pick at least two exams"). */
function serverErrors(error: unknown): Errors {
  const byField = fieldErrors(error);
  const out: Errors = {};
  for (const [path, message] of Object.entries(byField)) {
    const field = path.split(".")[0] as Field;
    if ((field === "name" || field === "exams" || field === "reviewerIds") && !out[field]) out[field] = message;
  }
  if (Object.keys(out).length > 0) return out;
  const message = error instanceof Error ? error.message : "The set could not be created.";
  const { field, text } = splitFieldMessage(message);
  if (field === "name" || field === "exams" || field === "reviewerIds") return { [field]: text };
  return { form: message };
}

export default function NewCalibrationSetPage() {
  const navigate = useNavigate();
  const create = useCreateCalibrationSet();
  const [name, setName] = useState("");
  const [picked, setPicked] = useState<Set<string>>(new Set());
  const [pasted, setPasted] = useState("");
  const [reviewers, setReviewers] = useState<Set<string> | null>(null);
  const [errors, setErrors] = useState<Errors>({});

  const lines = pastedLines(pasted);
  const examIds = [...new Set([...picked, ...lines])];

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
    create.mutate(
      { name: name.trim(), exams: examIds.map((examId) => ({ examId })), ...(reviewers ? { reviewerIds: [...reviewers] } : {}) },
      {
        onSuccess: ({ id }) =>
          navigate(`/oversight/calibration/${id}`, {
            state: { notice: `Calibration set created: ${examIds.length} exams sent to the reviewers' queues.` },
          }),
        onError: (error) => setErrors(serverErrors(error)),
      },
    );
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
        <FormMessage message={errors.form} />
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
