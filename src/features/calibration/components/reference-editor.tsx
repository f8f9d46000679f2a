// The QA lead's reference answer for one exam of a new calibration set: a level for each
// rubric criterion of the exam's application and a read of each finding, all optional.
// Compact and keyboard first: one Tab stop per row, arrow keys move within it, digits
// (criteria) or P / N / I (findings) pick, Delete clears; the anchor text of the level in
// focus (else the chosen one) shows under the row.
import { useId, useState, type KeyboardEvent } from "react";
import { CircleAlert } from "lucide-react";
import type { FindingRead } from "../../../../shared/catalogue";
import type { Criterion, ScoreValue } from "../../../../shared/rubric/types";
import { levelIndex } from "../../../../shared/rubric/logic";
import { Kbd } from "../../../components/ui/kbd";
import { READ_LABELS } from "../../../lib/catalogue";
import { hasCommandModifier } from "../../../lib/keyboard";
import type { ReferenceForm } from "../api/calibration";

/** A reference answer being edited: values by criterion key, reads by finding key. */
export interface ReferenceDraft {
  scores: Record<string, ScoreValue>;
  reads: Record<string, FindingRead>;
}

/** Server messages for one exam of the set, placed beside their fields. */
export interface ExamErrors {
  exam?: string;
  reference?: string;
  scores: Record<string, string>;
  reads: Record<string, string>;
}

export const EMPTY_DRAFT: ReferenceDraft = { scores: {}, reads: {} };

/** True when the draft gives anything to compare. */
export const draftHasValues = (d: ReferenceDraft | undefined) => !!d && (Object.keys(d.scores).length > 0 || Object.keys(d.reads).length > 0);

const READS: { read: FindingRead; key: string }[] = [
  { read: "positive", key: "p" },
  { read: "negative", key: "n" },
  { read: "indeterminate", key: "i" },
];

const chipClass = (checked: boolean) =>
  "inline-flex cursor-pointer items-center gap-1 rounded px-1.5 py-0.5 text-sm has-[:focus-visible]:outline-2 has-[:focus-visible]:outline-sea-600 " +
  (checked ? "bg-sea-50 font-semibold text-sea-800 ring-1 ring-sea-600" : "text-ink-900 ring-1 ring-slate-200 hover:bg-paper-200");

const clearClass =
  "rounded px-1.5 py-0.5 text-xs font-semibold text-sea-700 underline-offset-2 hover:underline focus-visible:outline-2 focus-visible:outline-sea-600";

function ErrorLine({ id, message }: { id: string; message?: string }) {
  if (!message) return null;
  return (
    <p id={id} className="mt-0.5 flex items-start gap-1 text-xs font-semibold text-coral-700">
      <CircleAlert aria-hidden="true" className="mt-px size-3.5 shrink-0" />
      {message}
    </p>
  );
}

function without<T>(record: Record<string, T>, key: string): Record<string, T> {
  const next = { ...record };
  delete next[key];
  return next;
}

/** Moves focus to the next (1) or previous (-1) row of the editor: its chosen radio, else its first input. */
function advance(row: HTMLElement, direction: 1 | -1) {
  const stops = [...(row.closest("[data-reference-editor]")?.querySelectorAll<HTMLElement>("[data-reference-stop]") ?? [])];
  const next = stops[stops.indexOf(row) + direction];
  (next?.querySelector<HTMLInputElement>("input:checked") ?? next?.querySelector<HTMLInputElement>("input"))?.focus();
}

/** Enter moves between rows (and never submits the form); Delete and Backspace clear the row. */
function rowKeys(e: KeyboardEvent<HTMLElement>, clear: () => void): boolean {
  if (e.key === "Enter") {
    e.preventDefault();
    advance(e.currentTarget, e.shiftKey ? -1 : 1);
    return true;
  }
  if (e.key === "Delete" || e.key === "Backspace") {
    e.preventDefault();
    clear();
    return true;
  }
  return false;
}

/** Focus the radio of a given value inside a row after a shortcut picked it. */
function focusRadio(row: HTMLElement, value: string) {
  row.querySelector<HTMLInputElement>(`input[type="radio"][value="${CSS.escape(value)}"]`)?.focus();
}

function CriterionRow({
  name,
  criterion: c,
  value,
  error,
  onChange,
}: {
  name: string;
  criterion: Criterion;
  value: ScoreValue | undefined;
  error?: string;
  onChange: (value: ScoreValue | undefined) => void;
}) {
  const id = useId();
  const labelId = `${id}-label`;
  const anchorId = `${id}-anchor`;
  const errorId = `${id}-error`;
  const chosen = levelIndex(c, value);
  const [pointed, setPointed] = useState<number | null>(null);
  const shown = c.levels[pointed ?? chosen];

  const onKeyDown = (e: KeyboardEvent<HTMLDivElement>) => {
    if (hasCommandModifier(e) || rowKeys(e, () => onChange(undefined)) || !/^[0-9]$/.test(e.key)) return;
    const level = c.levels[(e.key === "0" ? 10 : Number(e.key)) - 1];
    if (!level) return;
    e.preventDefault();
    onChange(level.value);
    focusRadio(e.currentTarget, level.value);
  };

  if (c.kind === "number") return <NumberRow criterion={c} value={value} error={error} onChange={onChange} />;

  return (
    <div
      role="radiogroup"
      aria-labelledby={labelId}
      aria-describedby={error ? errorId : undefined}
      aria-invalid={error ? true : undefined}
      onKeyDown={onKeyDown}
      onBlur={(e) => {
        if (!e.currentTarget.contains(e.relatedTarget as Node | null)) setPointed(null);
      }}
      onMouseLeave={() => setPointed(null)}
      aria-keyshortcuts="Delete"
      className="py-1.5"
      data-criterion={c.key}
      data-reference-stop
    >
      <div className="flex flex-wrap items-center gap-x-3 gap-y-1">
        <span id={labelId} className="w-44 shrink-0 text-sm font-semibold text-ink-900">
          {c.label}
        </span>
        <div className="flex flex-wrap gap-1">
          {c.levels.map((level, i) => {
            const inputId = `${id}-l${i}`;
            return (
              <label key={level.value} htmlFor={inputId} className={chipClass(chosen === i)} onMouseEnter={() => setPointed(i)}>
                <input
                  id={inputId}
                  type="radio"
                  name={name}
                  value={level.value}
                  checked={chosen === i}
                  onChange={() => onChange(level.value)}
                  onFocus={() => setPointed(i)}
                  aria-labelledby={`${inputId}-name`}
                  aria-describedby={level.anchor ? `${inputId}-anchor` : undefined}
                  aria-keyshortcuts={i < 10 ? String((i + 1) % 10) : undefined}
                  className="sr-only"
                />
                {/* A level already named by its digit (quality 1–5) needs no second key cap. */}
                {i < 10 && level.label !== String((i + 1) % 10) ? (
                  <span aria-hidden="true">
                    <Kbd>{(i + 1) % 10}</Kbd>
                  </span>
                ) : null}
                <span id={`${inputId}-name`}>{level.label}</span>
                {level.anchor ? (
                  <span id={`${inputId}-anchor`} className="sr-only">
                    {level.anchor}
                  </span>
                ) : null}
              </label>
            );
          })}
        </div>
        {value !== undefined ? (
          <button type="button" tabIndex={-1} className={clearClass} onClick={() => onChange(undefined)}>
            Clear<span className="sr-only"> {c.label}</span>
          </button>
        ) : (
          <span className="text-xs text-slate-500">not compared</span>
        )}
      </div>
      <p id={anchorId} aria-hidden="true" data-anchor className="mt-0.5 min-h-4 pl-0 text-xs leading-snug text-slate-600 sm:pl-47">
        {shown?.anchor ? (
          <>
            <span className="font-semibold text-slate-700">{shown.label}:</span> {shown.anchor}
          </>
        ) : null}
      </p>
      <ErrorLine id={errorId} message={error} />
    </div>
  );
}

function NumberRow({
  criterion: c,
  value,
  error,
  onChange,
}: {
  criterion: Criterion;
  value: ScoreValue | undefined;
  error?: string;
  onChange: (value: ScoreValue | undefined) => void;
}) {
  const id = useId();
  const errorId = `${id}-error`;
  // The typed text stays as typed ("1." on the way to "1.5"); the answer holds its number.
  const [text, setText] = useState(value === undefined ? "" : String(value));
  const shownText = value === undefined && text !== "" && !Number.isNaN(Number(text)) ? "" : text;
  const range = c.min !== null && c.max !== null ? `${c.min} to ${c.max}` : c.min !== null ? `at least ${c.min}` : c.max !== null ? `at most ${c.max}` : "";
  return (
    <div
      className="py-1.5"
      data-criterion={c.key}
      data-reference-stop
      onKeyDown={(e) => {
        if (e.key === "Enter") {
          e.preventDefault();
          advance(e.currentTarget, e.shiftKey ? -1 : 1);
        }
      }}
    >
      <div className="flex flex-wrap items-center gap-x-3 gap-y-1">
        <label htmlFor={`${id}-n`} className="w-44 shrink-0 text-sm font-semibold text-ink-900">
          {c.label}
        </label>
        <input
          id={`${id}-n`}
          type="text"
          inputMode="decimal"
          value={shownText}
          aria-invalid={error ? true : undefined}
          aria-describedby={[range ? `${id}-range` : null, error ? errorId : null].filter(Boolean).join(" ") || undefined}
          onChange={(e) => {
            const t = e.target.value;
            setText(t);
            const n = Number(t.replace(",", "."));
            onChange(t.trim() === "" || !Number.isFinite(n) ? undefined : n);
          }}
          className={
            "w-28 rounded-md border bg-white px-2 py-1 text-sm tabular-nums text-ink-950 focus-visible:outline-2 focus-visible:outline-offset-1 focus-visible:outline-sea-600 " +
            (error ? "border-coral-600" : "border-slate-400")
          }
        />
        {range ? (
          <span id={`${id}-range`} className="text-xs text-slate-600">
            {range}
          </span>
        ) : null}
        {value === undefined ? <span className="text-xs text-slate-500">not compared</span> : null}
      </div>
      <ErrorLine id={errorId} message={error} />
    </div>
  );
}

function FindingRow({
  name,
  finding,
  value,
  error,
  onChange,
}: {
  name: string;
  finding: { key: string; label: string };
  value: FindingRead | undefined;
  error?: string;
  onChange: (read: FindingRead | undefined) => void;
}) {
  const id = useId();
  const errorId = `${id}-error`;
  const onKeyDown = (e: KeyboardEvent<HTMLDivElement>) => {
    if (hasCommandModifier(e) || rowKeys(e, () => onChange(undefined))) return;
    const match = READS.find((r) => r.key === e.key.toLowerCase());
    if (!match) return;
    e.preventDefault();
    onChange(match.read);
    focusRadio(e.currentTarget, match.read);
  };
  return (
    <div
      role="radiogroup"
      aria-labelledby={`${id}-label`}
      aria-describedby={error ? errorId : undefined}
      aria-invalid={error ? true : undefined}
      onKeyDown={onKeyDown}
      aria-keyshortcuts="Delete"
      className="py-1"
      data-finding={finding.key}
      data-reference-stop
    >
      <div className="flex flex-wrap items-center gap-x-3 gap-y-1">
        <span id={`${id}-label`} className="w-44 shrink-0 text-sm font-semibold text-ink-900">
          {finding.label}
        </span>
        <div className="flex flex-wrap gap-1">
          {READS.map(({ read, key }) => (
            <label key={read} htmlFor={`${id}-${read}`} className={chipClass(value === read)}>
              <input
                id={`${id}-${read}`}
                type="radio"
                name={name}
                value={read}
                checked={value === read}
                onChange={() => onChange(read)}
                aria-keyshortcuts={key.toUpperCase()}
                className="sr-only"
              />
              {READ_LABELS[read]}
              <span aria-hidden="true">
                <Kbd>{key.toUpperCase()}</Kbd>
              </span>
            </label>
          ))}
        </div>
        {value !== undefined ? (
          <button type="button" tabIndex={-1} className={clearClass} onClick={() => onChange(undefined)}>
            Clear<span className="sr-only"> {finding.label}</span>
          </button>
        ) : (
          <span className="text-xs text-slate-500">not compared</span>
        )}
      </div>
      <ErrorLine id={errorId} message={error} />
    </div>
  );
}

/** The editor body: the exam's criteria and findings, each optional. */
export function ReferenceEditor({
  form,
  draft,
  errors,
  onChange,
}: {
  form: ReferenceForm;
  draft: ReferenceDraft;
  errors?: ExamErrors;
  onChange: (next: ReferenceDraft) => void;
}) {
  const name = (kind: string, key: string) => `reference-${form.exam.id}-${kind}-${key}`;
  return (
    <div className="space-y-3" data-reference-editor>
      <p className="text-xs text-slate-600">
        Rubric “{form.rubric.name}”, version {form.rubric.version}, as the reviewers will use it. Leave a row empty to leave it out of the comparison. In a row:
        arrow keys or <Kbd>1</Kbd>–<Kbd>9</Kbd> pick a level, <Kbd>P</Kbd> <Kbd>N</Kbd> <Kbd>I</Kbd> a read, <Kbd>Delete</Kbd> clears, <Kbd>Enter</Kbd> moves to
        the next row.
      </p>
      <fieldset>
        <legend className="text-xs font-semibold uppercase tracking-wide text-slate-700">Criteria</legend>
        <div className="divide-y divide-slate-100">
          {form.criteria.map((c) => (
            <CriterionRow
              key={c.key}
              name={name("score", c.key)}
              criterion={c}
              value={draft.scores[c.key]}
              error={errors?.scores[c.key]}
              onChange={(v) => onChange({ ...draft, scores: v === undefined ? without(draft.scores, c.key) : { ...draft.scores, [c.key]: v } })}
            />
          ))}
        </div>
      </fieldset>
      {form.findings.length > 0 ? (
        <fieldset>
          <legend className="text-xs font-semibold uppercase tracking-wide text-slate-700">Findings</legend>
          <div className="divide-y divide-slate-100">
            {form.findings.map((f) => (
              <FindingRow
                key={f.key}
                name={name("read", f.key)}
                finding={f}
                value={draft.reads[f.key]}
                error={errors?.reads[f.key]}
                onChange={(r) => onChange({ ...draft, reads: r === undefined ? without(draft.reads, f.key) : { ...draft.reads, [f.key]: r } })}
              />
            ))}
          </div>
        </fieldset>
      ) : null}
    </div>
  );
}
