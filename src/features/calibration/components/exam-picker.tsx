// Choosing a calibration set's exams: recent exams where two reviewers scored overall image
// quality differently (from the agreement report) as checkboxes, plus exam ids pasted one a line.
import { useId } from "react";
import { useQuery } from "@tanstack/react-query";
import { FieldError } from "../../../components/ui/text-field";
import { ErrorState, LoadingState } from "../../../components/ui/states";
import { candidateExamsQuery, type CandidateExam } from "../api/calibration";

const textareaClass =
  "mt-1 block w-full rounded-md border bg-white px-3 py-2 font-mono text-sm text-ink-950 placeholder:text-slate-500 " +
  "focus-visible:outline-2 focus-visible:outline-offset-1 focus-visible:outline-sea-600";

function shown(v: string | number | null) {
  return v === null || v === "" ? "—" : String(v);
}

/** One entry per exam: the report lists an exam once per pair of reads that disagree. */
function uniqueByExam(rows: CandidateExam[]): CandidateExam[] {
  return [...new Map(rows.map((r) => [r.examId, r])).values()];
}

export function ExamPicker({
  picked,
  onToggle,
  pasted,
  onPastedChange,
  error,
}: {
  picked: ReadonlySet<string>;
  onToggle: (examId: string, on: boolean) => void;
  pasted: string;
  onPastedChange: (text: string) => void;
  error?: string;
}) {
  const id = useId();
  const errorId = `${id}-error`;
  const candidates = useQuery(candidateExamsQuery);
  const rows = candidates.data ? uniqueByExam(candidates.data) : [];

  return (
    <fieldset aria-describedby={error ? errorId : undefined} className="space-y-3">
      <legend className="text-sm font-semibold text-ink-900">Exams</legend>
      <p className="text-sm text-slate-600">Pick at least two. Exams on which two reviewers already disagreed make good calibration cases.</p>
      <div className="rounded-lg border border-slate-200 bg-white">
        <p className="border-b border-slate-200 bg-paper-200 px-3 py-2 text-xs font-semibold uppercase tracking-wide text-slate-700">
          Recent disagreements on overall image quality
        </p>
        {candidates.isPending ? (
          <div className="px-3">
            <LoadingState label="Loading exams with disagreements…" />
          </div>
        ) : candidates.isError ? (
          <div className="p-3">
            <ErrorState error={candidates.error} onRetry={() => void candidates.refetch()} retrying={candidates.isFetching} />
          </div>
        ) : rows.length === 0 ? (
          <p className="px-3 py-4 text-sm text-slate-600">No recent disagreements. Paste exam ids below instead.</p>
        ) : (
          <ul className="max-h-72 divide-y divide-slate-100 overflow-y-auto">
            {rows.map((r) => (
              <li key={r.examId}>
                <label htmlFor={`${id}-${r.examId}`} className="flex cursor-pointer items-start gap-2 px-3 py-2 hover:bg-paper-200">
                  <input
                    id={`${id}-${r.examId}`}
                    type="checkbox"
                    className="mt-1 size-4 accent-sea-600"
                    checked={picked.has(r.examId)}
                    onChange={(e) => onToggle(r.examId, e.target.checked)}
                    aria-invalid={error ? true : undefined}
                  />
                  <span>
                    <span className="block font-mono text-sm font-semibold text-ink-900">{r.code}</span>
                    <span className="block text-xs text-slate-600">
                      {r.application} · scored {shown(r.a)} and {shown(r.b)}
                    </span>
                  </span>
                </label>
              </li>
            ))}
          </ul>
        )}
      </div>
      <div>
        <label htmlFor={`${id}-ids`} className="block text-sm font-semibold text-ink-900">
          Exam ids
        </label>
        <p id={`${id}-ids-hint`} className="mt-0.5 text-sm text-slate-600">
          Optional. One exam id a line, for exams not listed above.
        </p>
        <textarea
          id={`${id}-ids`}
          rows={4}
          value={pasted}
          onChange={(e) => onPastedChange(e.target.value)}
          aria-describedby={`${id}-ids-hint`}
          aria-invalid={error ? true : undefined}
          spellCheck={false}
          className={`${textareaClass} ${error ? "border-coral-600" : "border-slate-400"}`}
        />
      </div>
      <FieldError id={errorId} message={error} />
    </fieldset>
  );
}
