// Both reads side by side, per criterion and per finding, with the final choice in the same
// row. Rows where the reads differ beyond tolerance carry a "Differs" word and icon, not only
// a tint. Final scores start from the primary read.
import { useMemo } from "react";
import { useForm } from "react-hook-form";
import { CircleAlert, CircleCheck } from "lucide-react";
import type { FindingRead } from "../../../../shared/catalogue";
import { FINDING_READS } from "../../../../shared/catalogue";
import { criteriaFor, scoreIssues } from "../../../../shared/rubric/logic";
import type { Criterion, ScoreValue } from "../../../../shared/rubric/types";
import { Button } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { FieldError } from "../../../components/ui/text-field";
import { errorMessage, fieldErrors } from "../../../lib/api-errors";
import { READ_LABELS } from "../../../lib/catalogue";
import type { AdjudicateBody, Adjudication } from "../api/oversight";

type FormValues = { scores: Record<string, string>; reads: Record<string, FindingRead | "">; note: string; limited: boolean };

const th = "px-3 py-2 font-semibold";
const td = "px-3 py-2 align-top";
const finalSelect = "block w-full rounded-md border border-slate-400 bg-white px-2 py-1 text-sm focus-visible:outline-2 focus-visible:outline-sea-600";

/** The head row both comparison tables share: their own first columns, then Reads and Final. */
function ComparisonHead({ columns }: { columns: string[] }) {
  return (
    <thead className="border-y border-slate-200 bg-paper-200 text-xs uppercase tracking-wide text-slate-700">
      <tr>
        {[...columns, "Reads", "Final"].map((c) => (
          <th key={c} scope="col" className={th}>
            {c}
          </th>
        ))}
      </tr>
    </thead>
  );
}

function scoreWords(c: Criterion, v: ScoreValue | undefined): string {
  if (v === undefined || v === null || v === "") return "—";
  const level = c.levels.find((l) => l.value === String(v));
  return level ? level.label : String(v);
}

function Agreement({ differs }: { differs: boolean }) {
  return differs ? (
    <span className="inline-flex items-center gap-1 whitespace-nowrap font-semibold text-coral-700">
      <CircleAlert aria-hidden="true" className="size-4" />
      Differs
    </span>
  ) : (
    <span className="inline-flex items-center gap-1 whitespace-nowrap text-slate-600">
      <CircleCheck aria-hidden="true" className="size-4" />
      Agrees
    </span>
  );
}

type Props = {
  item: Adjudication;
  findings: { key: string; label: string }[];
  sonographerReads: Record<string, FindingRead>;
  busy: boolean;
  error: unknown;
  onSubmit: (body: AdjudicateBody) => void;
};

export function AdjudicationForm({ item, findings, sonographerReads, busy, error, onSubmit }: Props) {
  const criteria = useMemo(() => (item.rubric ? criteriaFor(item.rubric.criteria, item.application.code) : []), [item]);
  const primary = item.reads.find((r) => r.kind === "primary");
  const second = item.reads.find((r) => r.kind === "second");
  const readOf = (r: typeof primary, key: string) => r?.reads.find((x) => x.key === key)?.read;

  const form = useForm<FormValues>({
    defaultValues: {
      scores: Object.fromEntries(criteria.map((c) => [c.key, primary?.scores[c.key] !== undefined ? String(primary.scores[c.key]) : ""])),
      reads: Object.fromEntries(findings.map((f) => [f.key, readOf(primary, f.key) ?? ""])),
      note: "",
      limited: primary?.limited ?? false,
    },
  });
  const errors = form.formState.errors;
  const server = fieldErrors(error);

  const submit = form.handleSubmit((values) => {
    const scores: Record<string, ScoreValue> = {};
    for (const c of criteria) {
      const raw = values.scores[c.key] ?? "";
      if (raw === "") continue;
      scores[c.key] = c.kind === "number" ? Number(raw) : raw;
    }
    const issues = scoreIssues(criteria, item.application.code, scores, item.rubric?.version ?? 0);
    let first = true;
    for (const issue of issues) {
      form.setError(issue.path as `scores.${string}`, { type: "rubric", message: issue.message }, { shouldFocus: first });
      first = false;
    }
    const reads: AdjudicateBody["reads"] = [];
    for (const f of findings) {
      const r = values.reads[f.key];
      if (!r) {
        form.setError(`reads.${f.key}`, { type: "required", message: "Choose the final read" }, { shouldFocus: first });
        first = false;
      } else reads.push({ key: f.key, read: r });
    }
    if (!first) return;
    onSubmit({ scores, reads, note: values.note.trim(), limited: values.limited });
  });

  const differs = new Set(item.disagreements);
  const rowClass = (d: boolean) => (d ? "bg-coral-50/70" : undefined);

  return (
    <form onSubmit={submit} noValidate className="space-y-6">
      <section aria-labelledby="scores-heading" className="rounded-lg border border-slate-200 bg-white">
        <h2 id="scores-heading" className="px-4 pt-4 text-lg font-semibold text-ink-950">
          Scores
        </h2>
        <p className="px-4 text-sm text-slate-600">
          {differs.size > 0 ? `${item.disagreements.filter((d) => !d.startsWith("read.")).length} of ${criteria.length} criteria differ beyond tolerance.` : ""}{" "}
          The final scores start from the primary read.
        </p>
        <div className="mt-3 overflow-x-auto">
          <table className="w-full text-left text-sm">
            <caption className="sr-only">Both reads per criterion and the final score</caption>
            <ComparisonHead columns={["Criterion", `Primary · ${primary?.reviewer ?? "—"}`, `Second · ${second?.reviewer ?? "—"}`]} />
            <tbody className="divide-y divide-slate-100">
              {criteria.map((c) => {
                const d = differs.has(c.key);
                const message = errors.scores?.[c.key]?.message ?? server[`scores.${c.key}`];
                const id = `final-${c.key}`;
                return (
                  <tr key={c.key} className={rowClass(d)} data-differs={d || undefined}>
                    <th scope="row" className={`${td} font-semibold text-ink-950`}>
                      {c.label}
                      {c.critical ? <span className="block text-xs font-normal text-slate-600">Critical</span> : null}
                      {c.tolerance > 0 ? <span className="block text-xs font-normal text-slate-600">Tolerance {c.tolerance}</span> : null}
                    </th>
                    <td className={td}>{scoreWords(c, primary?.scores[c.key])}</td>
                    <td className={td}>{scoreWords(c, second?.scores[c.key])}</td>
                    <td className={td}>
                      <Agreement differs={d} />
                    </td>
                    <td className={`${td} min-w-48`}>
                      <label htmlFor={id} className="sr-only">
                        Final {c.label}
                      </label>
                      {c.kind === "number" ? (
                        <input
                          id={id}
                          type="number"
                          min={c.min ?? undefined}
                          max={c.max ?? undefined}
                          aria-invalid={message ? true : undefined}
                          aria-describedby={`${id}-error`}
                          className="block w-28 rounded-md border border-slate-400 bg-white px-2 py-1 text-sm tabular-nums focus-visible:outline-2 focus-visible:outline-sea-600"
                          {...form.register(`scores.${c.key}`)}
                        />
                      ) : (
                        <select
                          id={id}
                          aria-invalid={message ? true : undefined}
                          aria-describedby={`${id}-error`}
                          className={finalSelect}
                          {...form.register(`scores.${c.key}`)}
                        >
                          <option value="">{c.required ? "Choose…" : "Not scored"}</option>
                          {c.levels.map((l) => (
                            <option key={l.value} value={l.value}>
                              {l.label}
                            </option>
                          ))}
                        </select>
                      )}
                      <FieldError id={`${id}-error`} message={message} />
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      </section>

      <section aria-labelledby="reads-heading" className="rounded-lg border border-slate-200 bg-white">
        <h2 id="reads-heading" className="px-4 pt-4 text-lg font-semibold text-ink-950">
          Interpretation
        </h2>
        <p className="px-4 text-sm text-slate-600">
          The final read of each finding becomes the reference for the clinician&apos;s true and false positives and negatives.
        </p>
        {findings.length === 0 ? (
          <p className="px-4 py-3 text-sm text-slate-600">This application asks about no findings.</p>
        ) : (
          <div className="mt-3 overflow-x-auto">
            <table className="w-full text-left text-sm">
              <caption className="sr-only">The clinician&apos;s read, both reviewers&apos; reads and the final read of each finding</caption>
              <ComparisonHead columns={["Finding", "Clinician", "Primary", "Second"]} />
              <tbody className="divide-y divide-slate-100">
                {findings.map((f) => {
                  const d = differs.has(`read.${f.key}`);
                  const id = `final-read-${f.key}`;
                  const message = errors.reads?.[f.key]?.message;
                  const words = (r: FindingRead | undefined) => (r ? READ_LABELS[r] : "—");
                  return (
                    <tr key={f.key} className={rowClass(d)} data-differs={d || undefined}>
                      <th scope="row" className={`${td} font-semibold text-ink-950`}>
                        {f.label}
                      </th>
                      <td className={td}>{words(sonographerReads[f.key])}</td>
                      <td className={td}>{words(readOf(primary, f.key))}</td>
                      <td className={td}>{words(readOf(second, f.key))}</td>
                      <td className={td}>
                        <Agreement differs={d} />
                      </td>
                      <td className={`${td} min-w-40`}>
                        <label htmlFor={id} className="sr-only">
                          Final read of {f.label}
                        </label>
                        <select
                          id={id}
                          aria-invalid={message ? true : undefined}
                          aria-describedby={`${id}-error`}
                          className={finalSelect}
                          {...form.register(`reads.${f.key}`)}
                        >
                          <option value="">Choose…</option>
                          {FINDING_READS.map((r) => (
                            <option key={r} value={r}>
                              {READ_LABELS[r]}
                            </option>
                          ))}
                        </select>
                        <FieldError id={`${id}-error`} message={message} />
                      </td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
        )}
      </section>

      <section aria-labelledby="note-heading" className="rounded-lg border border-slate-200 bg-white p-4">
        <h2 id="note-heading" className="text-lg font-semibold text-ink-950">
          Decision
        </h2>
        <label htmlFor="adjudication-note" className="mt-2 block text-sm font-semibold text-ink-900">
          Adjudication note
        </label>
        <p id="adjudication-note-hint" className="text-sm text-slate-600">
          Why the final result is what it is. The clinician sees this note with the feedback.
        </p>
        <textarea
          id="adjudication-note"
          rows={3}
          maxLength={2000}
          aria-describedby="adjudication-note-hint"
          className="mt-1 block w-full rounded-md border border-slate-400 bg-white px-3 py-2 text-base focus-visible:outline-2 focus-visible:outline-offset-1 focus-visible:outline-sea-600"
          {...form.register("note")}
        />
        <label className="mt-3 flex items-start gap-2 text-sm text-ink-900">
          <input type="checkbox" className="mt-0.5 size-4 accent-sea-600" {...form.register("limited")} />
          <span>
            <span className="font-semibold">Technically limited by patient factors</span>
            <span className="block text-slate-600">No credit, and not counted as poor technique.</span>
          </span>
        </label>
        <div className="mt-3">
          <FormMessage message={error ? errorMessage(error, "The final result was not saved; try again.") : null} />
        </div>
        <div className="mt-3 flex justify-end">
          <Button type="submit" busy={busy}>
            Set the final result
          </Button>
        </div>
      </section>
    </form>
  );
}
