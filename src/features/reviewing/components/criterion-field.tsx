// One rubric criterion: its levels as a radio group with every anchor text visible, or a
// number field. Keyboard first: digits 1–9 (0 for the tenth) pick the n-th level of the
// focused criterion; Enter moves on (Shift+Enter back), as Tab and Shift+Tab do.
import { useId, type KeyboardEvent } from "react";
import { CircleAlert, ShieldAlert } from "lucide-react";
import type { Criterion, ScoreValue } from "../../../../shared/rubric/types";
import { levelIndex } from "../../../../shared/rubric/logic";
import { Kbd } from "../../../components/ui/kbd";
import { hasCommandModifier } from "../../../lib/keyboard";

type Props = {
  criterion: Criterion;
  position: number;
  value: ScoreValue | undefined;
  error?: string;
  onChange: (value: ScoreValue | undefined) => void;
  /** Move focus to the next (1) or previous (-1) stop of the rubric. */
  onAdvance: (direction: 1 | -1) => void;
  onFocusCriterion: () => void;
  /** What the exam's application says about this criterion (the orientation convention). */
  note?: string;
};

/** The id of the element that holds a criterion (focus goes to its checked level, else its first). */
export const criterionStopId = (key: string) => `criterion-${key}`;

export function CriterionField({ criterion: c, position, value, error, onChange, onAdvance, onFocusCriterion, note }: Props) {
  const id = useId();
  const legendId = `${id}-legend`;
  const helpId = `${id}-help`;
  const noteId = `${id}-note`;
  const errorId = `${id}-error`;
  const chosen = levelIndex(c, value);

  const onKeyDown = (e: KeyboardEvent<HTMLFieldSetElement>) => {
    if (hasCommandModifier(e)) return;
    if (e.key === "Enter") {
      e.preventDefault();
      onAdvance(e.shiftKey ? -1 : 1);
      return;
    }
    if (c.kind === "number" || !/^[0-9]$/.test(e.key)) return;
    const n = e.key === "0" ? 10 : Number(e.key);
    const level = c.levels[n - 1];
    if (!level) return;
    e.preventDefault();
    onChange(level.value);
    e.currentTarget.querySelector<HTMLInputElement>(`input[data-level="${n - 1}"]`)?.focus();
  };

  return (
    <fieldset
      id={criterionStopId(c.key)}
      data-stop
      role={c.kind === "number" ? undefined : "radiogroup"}
      aria-labelledby={legendId}
      aria-describedby={[c.help ? helpId : null, note ? noteId : null, error ? errorId : null].filter(Boolean).join(" ") || undefined}
      aria-invalid={error ? true : undefined}
      aria-required={c.required || undefined}
      onKeyDown={onKeyDown}
      onFocus={onFocusCriterion}
      className={
        "rounded-md border bg-white px-2.5 py-2 focus-within:border-sea-600 focus-within:ring-1 focus-within:ring-sea-600 " +
        (error ? "border-coral-500" : "border-slate-200")
      }
    >
      <legend id={legendId} className="float-left flex w-full flex-wrap items-center gap-x-2 gap-y-0.5 text-sm">
        <span className="font-semibold text-ink-950">
          <span className="tabular-nums text-slate-600">{position}.</span> {c.label}
        </span>
        {c.required ? <span className="text-xs font-semibold text-slate-600">Required</span> : <span className="text-xs text-slate-600">Optional</span>}
        {c.critical ? (
          <span className="inline-flex items-center gap-0.5 rounded bg-sand-100 px-1 text-xs font-semibold text-sand-800">
            <ShieldAlert aria-hidden="true" className="size-3" />
            Critical
          </span>
        ) : null}
      </legend>
      {c.help ? (
        <p id={helpId} className="clear-both pt-0.5 text-xs text-slate-600">
          {c.help}
        </p>
      ) : null}
      {note ? (
        <p id={noteId} className="clear-both mt-1 rounded bg-sea-50 px-1.5 py-1 text-xs font-semibold text-sea-900">
          {note}
        </p>
      ) : null}

      {c.kind === "number" ? (
        <NumberInput criterion={c} value={value} labelledBy={legendId} onChange={onChange} />
      ) : (
        <div className="clear-both mt-1 space-y-0.5">
          {c.levels.map((level, i) => {
            const inputId = `${id}-l${i}`;
            const checked = chosen === i;
            return (
              <label
                key={level.value}
                htmlFor={inputId}
                className={
                  "grid cursor-pointer grid-cols-[auto_auto_minmax(0,1fr)] items-start gap-x-2 rounded px-1.5 py-1 " +
                  (checked ? "bg-sea-50 ring-1 ring-sea-600" : "hover:bg-paper-200")
                }
              >
                <input
                  id={inputId}
                  type="radio"
                  name={`score-${c.key}`}
                  value={level.value}
                  data-level={i}
                  checked={checked}
                  // One Tab stop per criterion (the chosen level, else the first), as in any radio group.
                  tabIndex={checked || (chosen < 0 && i === 0) ? 0 : -1}
                  onChange={() => onChange(level.value)}
                  aria-labelledby={`${inputId}-name`}
                  aria-describedby={level.anchor ? `${inputId}-anchor` : undefined}
                  aria-keyshortcuts={i < 10 ? String((i + 1) % 10) : undefined}
                  className="mt-0.5 size-4 accent-sea-600"
                />
                <span className="mt-px">{i < 10 ? <Kbd>{(i + 1) % 10}</Kbd> : null}</span>
                <span className="min-w-0 text-sm">
                  <span id={`${inputId}-name`} className={checked ? "font-semibold text-sea-800" : "font-semibold text-ink-900"}>
                    {level.label}
                  </span>
                  {c.critical && level.fails ? (
                    <span className="ml-1.5 inline-flex items-center gap-0.5 text-xs font-semibold text-coral-700">
                      <CircleAlert aria-hidden="true" className="size-3" />
                      blocks credit
                    </span>
                  ) : null}
                  {level.anchor ? (
                    <span id={`${inputId}-anchor`} className="block text-xs leading-snug text-slate-600">
                      {level.anchor}
                    </span>
                  ) : null}
                </span>
              </label>
            );
          })}
        </div>
      )}

      {error ? (
        <p id={errorId} className="mt-1 flex items-start gap-1 text-xs font-semibold text-coral-700">
          <CircleAlert aria-hidden="true" className="mt-px size-3.5 shrink-0" />
          {error}
        </p>
      ) : null}
    </fieldset>
  );
}

function NumberInput({
  criterion: c,
  value,
  labelledBy,
  onChange,
}: {
  criterion: Criterion;
  value: ScoreValue | undefined;
  labelledBy: string;
  onChange: (v: ScoreValue | undefined) => void;
}) {
  const range = c.min !== null && c.max !== null ? `${c.min} to ${c.max}` : c.min !== null ? `at least ${c.min}` : c.max !== null ? `at most ${c.max}` : null;
  return (
    <div className="clear-both mt-1 flex items-center gap-2">
      <input
        type="number"
        inputMode="decimal"
        step="any"
        min={c.min ?? undefined}
        max={c.max ?? undefined}
        defaultValue={typeof value === "number" ? value : value !== undefined ? Number(value) : ""}
        aria-labelledby={labelledBy}
        onChange={(e) => {
          const n = e.target.valueAsNumber;
          onChange(e.target.value === "" || Number.isNaN(n) ? undefined : n);
        }}
        className="w-28 rounded-md border border-slate-400 bg-white px-2 py-1 text-sm tabular-nums text-ink-950 focus-visible:outline-2 focus-visible:outline-offset-1 focus-visible:outline-sea-600"
      />
      {range ? <span className="text-xs text-slate-600">{range}</span> : null}
    </div>
  );
}
