// The last step of a draft: the attestation and Submit. Submit stays disabled, with the
// reason in words, until every clip is processed and at least one is ready.
import { useId, useState } from "react";
import type { Exam } from "../../../../shared/schemas/exams";
import { submitExamSchema } from "../../../../shared/schemas/exams";
import { Button } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { FieldError } from "../../../components/ui/text-field";

type Props = {
  exam: Exam;
  uploading: number;
  findingsMissing: number;
  busy: boolean;
  error: string | null;
  onSubmit: () => void;
};

const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;

/** Why the exam cannot be sent yet, or null when it can. */
export function blockingReason(exam: Exam, uploading: number, findingsMissing: number): string | null {
  const clips = exam.clips;
  const waiting = clips.filter((c) => c.state === "queued" || c.state === "processing").length;
  const failed = clips.filter((c) => c.state === "failed").length;
  if (uploading > 0) return `Wait until ${plural(uploading, "upload finishes", "uploads finish")}.`;
  if (clips.length === 0) return "Add at least one clip.";
  if (failed > 0) return `Retry or remove ${plural(failed, "clip that failed", "clips that failed")} processing.`;
  if (waiting > 0) return `Wait until ${plural(waiting, "clip is", "clips are")} processed.`;
  if (findingsMissing > 0) return `Record your read of ${plural(findingsMissing, "more finding", "more findings")} (indeterminate if unsure).`;
  return null;
}

export function SubmitPanel({ exam, uploading, findingsMissing, busy, error, onSubmit }: Props) {
  const checkboxId = useId();
  const reasonId = useId();
  const [attested, setAttested] = useState(false);
  const [attestError, setAttestError] = useState<string | undefined>();
  const reason = blockingReason(exam, uploading, findingsMissing);

  const submit = () => {
    const parsed = submitExamSchema.safeParse({ attestNoIdentifiers: attested });
    if (!parsed.success) {
      setAttestError(parsed.error.issues[0]?.message);
      document.getElementById(checkboxId)?.focus();
      return;
    }
    setAttestError(undefined);
    onSubmit();
  };

  return (
    <section aria-labelledby="submit-heading" className="rounded-lg border border-slate-200 bg-white p-5">
      <h2 id="submit-heading" className="text-lg font-semibold text-ink-950">
        Send for review
      </h2>
      <p className="mt-1 text-sm text-slate-600">Once submitted, the exam is read-only and enters the program's review queue without your name.</p>
      <div className="mt-4">
        <label htmlFor={checkboxId} className="flex items-start gap-2 text-sm text-ink-900">
          <input
            id={checkboxId}
            type="checkbox"
            checked={attested}
            onChange={(e) => {
              setAttested(e.target.checked);
              if (e.target.checked) setAttestError(undefined);
            }}
            aria-invalid={attestError ? true : undefined}
            aria-describedby={`${checkboxId}-error`}
            className="mt-0.5 size-4 accent-sea-600"
          />
          <span>No patient identifiers are visible in any clip: names, record numbers, dates of birth, or anything else that could identify the patient.</span>
        </label>
        <FieldError id={`${checkboxId}-error`} message={attestError} />
      </div>
      <div className="mt-4">
        <FormMessage message={error} />
      </div>
      <div className="mt-4 flex flex-wrap items-center gap-3">
        <Button onClick={submit} disabled={reason !== null} busy={busy} aria-describedby={reason ? reasonId : undefined}>
          Submit for review
        </Button>
        {reason ? (
          <p id={reasonId} className="text-sm text-slate-700">
            {reason}
          </p>
        ) : null}
      </div>
    </section>
  );
}
