// "Confirmatory results" of a submitted exam: for each finding, how it was later confirmed
// (CT, formal echo, surgery, clinical follow-up, or no confirmatory test) and what that
// showed, with a note. The sonographer enters them on their exam's page and the QA lead on
// the sonographer's page; accuracy against confirmatory results counts them. Errors from the
// shared schema (or the server's 400) are shown next to the field they concern.
import { useId, useState, type ReactNode } from "react";
import type { Confirmation, ConfirmationMethod } from "../../../../shared/schemas/progress";
import { CONFIRMATION_METHOD_LABELS, CONFIRMATION_METHODS, confirmationInputSchema } from "../../../../shared/schemas/progress";
import { fieldErrors } from "../../../lib/api-errors";
import { formatDateTime } from "../../../lib/format";
import { Button } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { SelectField } from "../../../components/ui/select-field";
import { FieldError } from "../../../components/ui/text-field";
import { ErrorState, LoadingState } from "../../../components/ui/states";
import { isConfirmationsRefusal, useConfirmations, useSaveConfirmations } from "../api/confirmations";

type Row = { findingKey: string; method: ConfirmationMethod | ""; result: "positive" | "negative" | ""; note: string };

const READ_WORDS: Record<Confirmation["sonographerRead"], string> = { positive: "Positive", negative: "Negative", indeterminate: "Indeterminate" };

const toRow = (c: Confirmation): Row => ({ findingKey: c.findingKey, method: c.method ?? "", result: c.result ?? "", note: c.note ?? "" });

/** Every row as the PUT body wants it; a row without a method clears anything saved for it. */
function toBody(rows: Row[]) {
  return rows.map((r) => ({
    findingKey: r.findingKey,
    method: r.method === "" ? null : r.method,
    result: r.method === "" || r.method === "none" || r.result === "" ? null : r.result,
    note: r.method === "" ? "" : r.note.trim(),
  }));
}

/** Client-side check with the shared schema: messages keyed "findingKey.field". */
function validate(rows: Row[]): Record<string, string> {
  const errors: Record<string, string> = {};
  for (const item of toBody(rows)) {
    const parsed = confirmationInputSchema.safeParse(item);
    if (!parsed.success) for (const issue of parsed.error.issues) errors[`${item.findingKey}.${String(issue.path[0] ?? "method")}`] ??= issue.message;
  }
  return errors;
}

function FindingRow({
  c,
  row,
  errors,
  disabled,
  onChange,
}: {
  c: Confirmation;
  row: Row;
  errors: Record<string, string>;
  disabled: boolean;
  onChange: (patch: Partial<Row>) => void;
}) {
  const id = useId();
  const noTest = row.method === "none" || row.method === "";
  const resultError = errors[`${c.findingKey}.result`];
  const noteError = errors[`${c.findingKey}.note`];
  return (
    <fieldset className="rounded-md border border-slate-200 bg-paper-50 p-3" aria-describedby={`${id}-read`}>
      <legend className="px-1 font-semibold text-ink-950">{c.label}</legend>
      <p id={`${id}-read`} className="mb-2 text-sm text-slate-700">
        Clinician’s read: <span className="font-semibold text-ink-900">{READ_WORDS[c.sonographerRead]}</span>
        {c.enteredAt ? (
          <span className="text-slate-600">
            {" "}
            · entered {formatDateTime(c.enteredAt)}
            {c.enteredBy ? ` by ${c.enteredBy}` : ""}
          </span>
        ) : null}
      </p>
      <div className="grid gap-3 md:grid-cols-[14rem_auto_1fr] md:items-start">
        <SelectField
          label="Confirmed by"
          compact
          value={row.method}
          disabled={disabled}
          error={errors[`${c.findingKey}.method`]}
          onChange={(e) => {
            const method = e.target.value as Row["method"];
            onChange({ method, result: method === "none" || method === "" ? "" : row.result });
          }}
        >
          <option value="">Not entered</option>
          {CONFIRMATION_METHODS.map((m) => (
            <option key={m} value={m}>
              {m === "none" ? "None (no confirmatory test)" : CONFIRMATION_METHOD_LABELS[m]}
            </option>
          ))}
        </SelectField>
        <fieldset aria-describedby={resultError ? `${id}-result-error` : undefined} aria-invalid={resultError ? true : undefined}>
          <legend className="block text-sm font-semibold text-ink-900">Result</legend>
          <div className="mt-1 flex gap-3">
            {(["positive", "negative"] as const).map((r) => (
              <label key={r} className={`inline-flex items-center gap-1.5 text-sm ${noTest ? "text-slate-500" : "text-ink-900"}`}>
                <input
                  type="radio"
                  name={`${id}-result`}
                  value={r}
                  checked={row.result === r}
                  disabled={disabled || noTest}
                  onChange={() => onChange({ result: r })}
                  className="size-4 accent-sea-600"
                />
                {r === "positive" ? "Positive" : "Negative"}
              </label>
            ))}
          </div>
          <FieldError id={`${id}-result-error`} message={resultError} />
        </fieldset>
        <div>
          <label htmlFor={`${id}-note`} className="block text-sm font-semibold text-ink-900">
            Note <span className="font-normal text-slate-600">(optional)</span>
          </label>
          <input
            id={`${id}-note`}
            type="text"
            maxLength={1000}
            value={row.note}
            disabled={disabled || row.method === ""}
            aria-invalid={noteError ? true : undefined}
            aria-describedby={noteError ? `${id}-note-error` : undefined}
            onChange={(e) => onChange({ note: e.target.value })}
            className={`mt-1 block w-full rounded-md border bg-white px-2 py-1 text-sm text-ink-950 focus-visible:outline-2 focus-visible:outline-offset-1 focus-visible:outline-sea-600 disabled:bg-slate-50 ${
              noteError ? "border-coral-600" : "border-slate-400"
            }`}
          />
          <FieldError id={`${id}-note-error`} message={noteError} />
        </div>
      </div>
    </fieldset>
  );
}

/** The form as it is, or folded behind a disclosure. */
function Fold({ collapsible, summary, children }: { collapsible: boolean; summary: string; children: ReactNode }) {
  if (!collapsible) return <>{children}</>;
  return (
    <details className="mt-3 rounded-md border border-slate-200">
      <summary className="cursor-pointer px-3 py-2 text-sm font-semibold text-sea-700">{summary}</summary>
      <div className="border-t border-slate-200 px-3 pb-3">{children}</div>
    </details>
  );
}

/**
 * Loads, edits and saves the confirmatory results of one submitted exam. Renders nothing for
 * viewers the server refuses. `collapsible` folds the fields behind a disclosure (the exam
 * page, where results arrive long after the exam) with a count of what is entered.
 */
export function ConfirmationsForm({ examId, headingLevel = 2, collapsible = false }: { examId: string; headingLevel?: 2 | 3; collapsible?: boolean }) {
  const headingId = useId();
  const query = useConfirmations(examId);
  const save = useSaveConfirmations(examId);
  const items = query.data?.items;
  const [rows, setRows] = useState<Row[] | null>(() => items?.map(toRow) ?? null);
  const [base, setBase] = useState(items);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [saved, setSaved] = useState(false);

  // Start from the server's answer, and follow it when it changes (a save, another person's
  // entry) unless the form holds unsaved edits. Adjusted during render, not in an effect.
  if (items !== base) {
    setBase(items);
    if (items && (!rows || !base || JSON.stringify(base.map(toRow)) === JSON.stringify(rows))) setRows(items.map(toRow));
  }

  if (query.isError && isConfirmationsRefusal(query.error)) return null;
  const Heading = headingLevel === 2 ? "h2" : "h3";
  const dirty = !!items && !!rows && JSON.stringify(items.map(toRow)) !== JSON.stringify(rows);

  const submit = (e: React.FormEvent) => {
    e.preventDefault();
    if (!rows) return;
    setSaved(false);
    const found = validate(rows);
    setErrors(found);
    if (Object.keys(found).length) return;
    const body = toBody(rows);
    save.mutate(
      { items: body },
      {
        onSuccess: () => setSaved(true),
        onError: (error) => {
          // "items.2.result" → the field of the finding sent third.
          const server: Record<string, string> = {};
          for (const [path, message] of Object.entries(fieldErrors(error))) {
            const [, index, field] = path.split(".");
            const item = body[Number(index)];
            if (item) server[`${item.findingKey}.${field ?? "method"}`] = message;
          }
          setErrors(server);
        },
      },
    );
  };

  const entered = (items ?? []).filter((c) => c.method !== null).length;
  const unmatchedServerError = save.isError && Object.keys(errors).length === 0 ? save.error.message : null;

  return (
    <section aria-labelledby={headingId} className="rounded-lg border border-slate-200 bg-white p-5">
      <Heading id={headingId} className="text-lg font-semibold text-ink-950">
        Confirmatory results
      </Heading>
      <p className="mt-1 max-w-prose text-sm text-slate-600">
        When a later test showed whether a finding was there — CT, a formal echo, surgery or clinical follow-up — record it here. Accuracy against confirmatory
        results on the Progress screen counts these. Leave a finding &ldquo;Not entered&rdquo; until the result is known.
      </p>
      {query.isPending ? (
        <LoadingState label="Loading confirmatory results…" />
      ) : query.isError ? (
        <ErrorState error={query.error} onRetry={() => void query.refetch()} retrying={query.isFetching} />
      ) : query.data.items.length === 0 ? (
        <p className="mt-3 text-sm text-slate-700">This application asks about no findings, so there is nothing to confirm.</p>
      ) : rows ? (
        <Fold
          collapsible={collapsible}
          summary={
            entered === 0
              ? "Enter confirmatory results"
              : `Change confirmatory results (${entered} of ${query.data.items.length} ${query.data.items.length === 1 ? "finding" : "findings"} entered)`
          }
        >
          <form onSubmit={submit} noValidate className="mt-4 space-y-3">
            {query.data.items.map((c) => {
              const row = rows.find((r) => r.findingKey === c.findingKey) ?? toRow(c);
              return (
                <FindingRow
                  key={c.findingKey}
                  c={c}
                  row={row}
                  errors={errors}
                  disabled={save.isPending}
                  onChange={(patch) => {
                    setSaved(false);
                    setRows((prev) => (prev ?? []).map((r) => (r.findingKey === c.findingKey ? { ...r, ...patch } : r)));
                    setErrors((prev) => {
                      const next = { ...prev };
                      for (const k of Object.keys(patch)) delete next[`${c.findingKey}.${k}`];
                      return next;
                    });
                  }}
                />
              );
            })}
            <FormMessage message={Object.keys(errors).length ? "Check the marked fields." : unmatchedServerError} />
            <FormMessage tone="success" message={saved && !dirty ? "Confirmatory results saved." : null} />
            <div className="flex justify-end">
              <Button type="submit" busy={save.isPending} disabled={!dirty}>
                Save confirmatory results
              </Button>
            </div>
          </form>
        </Fold>
      ) : null}
    </section>
  );
}
