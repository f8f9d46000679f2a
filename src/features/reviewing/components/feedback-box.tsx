// Feedback to the sonographer: free text plus the program's reusable snippets. Snippets for
// the criterion last focused come first, then general ones; a click (or Enter on one)
// inserts its text at the cursor.
import { useId, useRef } from "react";
import { TextQuote } from "lucide-react";
import type { Criterion } from "../../../../shared/rubric/types";
import type { Snippet } from "../api/workspace";

export const FEEDBACK_STOP_ID = "feedback-text";
const MAX = 5000;

type Props = {
  value: string;
  onChange: (text: string) => void;
  snippets: Snippet[];
  criteria: Criterion[];
  focusedCriterion: string | null;
  error?: string;
};

/** Snippets ordered for the criterion in focus: its own, then general ones, then the rest. */
export function orderSnippets(snippets: Snippet[], criterionKey: string | null): Snippet[] {
  const rank = (s: Snippet) => (criterionKey && s.criterionKey === criterionKey ? 0 : s.criterionKey === null ? 1 : 2);
  return [...snippets].sort((a, b) => rank(a) - rank(b));
}

export function FeedbackBox({ value, onChange, snippets, criteria, focusedCriterion, error }: Props) {
  const id = useId();
  const area = useRef<HTMLTextAreaElement>(null);
  const labelOf = (key: string | null) => (key ? (criteria.find((c) => c.key === key)?.label ?? key) : "General");
  const applicable = snippets.filter((s) => s.criterionKey === null || criteria.some((c) => c.key === s.criterionKey));
  const ordered = orderSnippets(applicable, focusedCriterion);

  const insert = (text: string) => {
    const el = area.current;
    const start = el?.selectionStart ?? value.length;
    const end = el?.selectionEnd ?? value.length;
    const before = value.slice(0, start);
    const after = value.slice(end);
    const glue = before && !/\s$/.test(before) ? (before.endsWith(".") ? " " : "\n") : "";
    const next = `${before}${glue}${text}${after}`.slice(0, MAX);
    onChange(next);
    const caret = (before + glue + text).length;
    requestAnimationFrame(() => {
      el?.focus();
      el?.setSelectionRange(caret, caret);
    });
  };

  return (
    <div className="space-y-2">
      <div className="flex items-baseline justify-between gap-2">
        <h2 className="text-sm font-semibold uppercase tracking-wide text-slate-700">
          <label htmlFor={FEEDBACK_STOP_ID}>Feedback to the clinician</label>
        </h2>
        <span className="text-xs tabular-nums text-slate-600">
          {value.length} / {MAX}
        </span>
      </div>
      <textarea
        ref={area}
        id={FEEDBACK_STOP_ID}
        data-stop
        value={value}
        maxLength={MAX}
        rows={5}
        onChange={(e) => onChange(e.target.value)}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-error` : `${id}-hint`}
        className={
          "block w-full rounded-md border bg-white px-2.5 py-1.5 text-sm text-ink-950 placeholder:text-slate-500 " +
          "focus-visible:outline-2 focus-visible:outline-offset-1 focus-visible:outline-sea-600 " +
          (error ? "border-coral-600" : "border-slate-400")
        }
        placeholder="What went well, what to change next time."
      />
      {error ? (
        <p id={`${id}-error`} className="text-xs font-semibold text-coral-700">
          {error}
        </p>
      ) : (
        <p id={`${id}-hint`} className="sr-only">
          The clinician reads this with the scores.
        </p>
      )}

      {ordered.length > 0 ? (
        <div>
          <h3 className="flex items-center gap-1 text-xs font-semibold text-slate-700">
            <TextQuote aria-hidden="true" className="size-3.5" />
            Snippets{focusedCriterion ? ` — ${labelOf(focusedCriterion)} first` : ""}
          </h3>
          <ul className="mt-1 max-h-40 space-y-1 overflow-y-auto pr-1">
            {ordered.map((s) => (
              <li key={s.id}>
                <button
                  type="button"
                  onClick={() => insert(s.text)}
                  className="w-full rounded border border-slate-200 bg-paper-50 px-2 py-1 text-left text-xs text-ink-900 hover:border-sea-400 hover:bg-sea-50 focus-visible:outline-2 focus-visible:outline-offset-1 focus-visible:outline-sea-600"
                >
                  <span className="mr-1 font-semibold text-slate-600">{labelOf(s.criterionKey)}:</span>
                  {s.text}
                  <span className="sr-only"> (insert into feedback)</span>
                </button>
              </li>
            ))}
          </ul>
        </div>
      ) : null}
    </div>
  );
}
