// Setup → Snippets: reusable feedback sentences reviewers insert while scoring, grouped by
// the criterion they belong to (or for any criterion). Snippets of a criterion also appear
// as next steps in the sonographer's feedback when that criterion misses its target.
import { useState } from "react";
import { useForm } from "react-hook-form";
import { useQuery } from "@tanstack/react-query";
import { Trash2 } from "lucide-react";
import { snippetInputSchema } from "../../../../shared/schemas/reviews";
import { Button } from "../../../components/ui/button";
import { ConfirmDialog } from "../../../components/ui/dialog";
import { FormMessage } from "../../../components/ui/form-message";
import { PageHeader } from "../../../components/ui/page-header";
import { SelectField } from "../../../components/ui/select-field";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { FieldError } from "../../../components/ui/text-field";
import { publishedCriteriaQuery, snippetsQuery, useAddSnippet, useDeleteSnippet, type Snippet } from "../api/settings";

type FormValues = { criterionKey: string; text: string };

function AddSnippetForm({ criteria }: { criteria: { key: string; label: string }[] }) {
  const add = useAddSnippet();
  const form = useForm<FormValues>({ defaultValues: { criterionKey: "", text: "" } });
  const error = form.formState.errors.text?.message;

  const onSubmit = form.handleSubmit(async (values) => {
    const parsed = snippetInputSchema.safeParse({ criterionKey: values.criterionKey || null, text: values.text });
    if (!parsed.success) {
      form.setError("text", { message: parsed.error.issues[0]?.message ?? "Check the snippet" }, { shouldFocus: true });
      return;
    }
    try {
      await add.mutateAsync(parsed.data);
      form.reset({ criterionKey: values.criterionKey, text: "" });
    } catch {
      // Shown from add.error.
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-3 rounded-lg border border-slate-200 bg-white p-5">
      <h2 className="text-lg font-semibold text-ink-950">Add a snippet</h2>
      <SelectField label="Criterion" className="max-w-sm" hint="Reviewers see it next to this criterion." {...form.register("criterionKey")}>
        <option value="">Any criterion (general feedback)</option>
        {criteria.map((c) => (
          <option key={c.key} value={c.key}>
            {c.label}
          </option>
        ))}
      </SelectField>
      <div>
        <label htmlFor="snippet-text" className="block text-sm font-semibold text-ink-900">
          Text
        </label>
        <textarea
          id="snippet-text"
          rows={3}
          maxLength={1000}
          aria-invalid={error ? true : undefined}
          aria-describedby="snippet-text-error"
          className={
            "mt-1 block w-full rounded-md border bg-white px-3 py-2 text-base focus-visible:outline-2 focus-visible:outline-offset-1 focus-visible:outline-sea-600 " +
            (error ? "border-coral-600" : "border-slate-400")
          }
          {...form.register("text")}
        />
        <FieldError id="snippet-text-error" message={error} />
      </div>
      <FormMessage message={add.isError ? add.error.message : null} />
      <Button type="submit" busy={add.isPending}>
        Add snippet
      </Button>
    </form>
  );
}

export default function SnippetsPage() {
  const snippets = useQuery(snippetsQuery);
  const criteria = useQuery(publishedCriteriaQuery);
  const remove = useDeleteSnippet();
  const [removing, setRemoving] = useState<Snippet | null>(null);
  const known = criteria.data ?? [];
  const labelOf = (key: string | null) =>
    key === null ? "Any criterion" : (known.find((c) => c.key === key)?.label ?? `${key} (not in the published rubric)`);

  const groups = new Map<string | null, Snippet[]>();
  for (const s of snippets.data ?? []) groups.set(s.criterionKey, [...(groups.get(s.criterionKey) ?? []), s]);

  return (
    <div className="space-y-6">
      <PageHeader
        eyebrow="Setup"
        title="Snippets"
        description="Reusable feedback sentences. Reviewers insert them while scoring, and a criterion's snippets are offered to the clinician as next steps when that criterion misses its target."
      />
      <AddSnippetForm criteria={known} />
      <section aria-labelledby="snippets-heading">
        <h2 id="snippets-heading" className="mb-3 text-lg font-semibold text-ink-950">
          Library
        </h2>
        {snippets.isPending ? (
          <LoadingState label="Loading snippets…" />
        ) : snippets.isError ? (
          <ErrorState error={snippets.error} onRetry={() => void snippets.refetch()} retrying={snippets.isFetching} />
        ) : snippets.data.length === 0 ? (
          <EmptyState title="No snippets yet">Add the sentences reviewers write most often, such as how to fix depth or gain.</EmptyState>
        ) : (
          <div className="space-y-4">
            {[...groups].map(([key, items]) => (
              <div key={key ?? "any"} className="rounded-lg border border-slate-200 bg-white">
                <h3 className="border-b border-slate-200 bg-paper-200 px-4 py-2 text-sm font-semibold text-ink-900">
                  {labelOf(key)} <span className="font-normal text-slate-600">· {items.length}</span>
                </h3>
                <ul className="divide-y divide-slate-100">
                  {items.map((s) => (
                    <li key={s.id} className="flex items-start justify-between gap-3 px-4 py-2 text-sm">
                      <p className="whitespace-pre-line text-ink-900">{s.text}</p>
                      <Button variant="ghost" size="sm" onClick={() => setRemoving(s)} aria-label={`Delete snippet: ${s.text.slice(0, 60)}`}>
                        <Trash2 aria-hidden="true" className="size-4" />
                        Delete
                      </Button>
                    </li>
                  ))}
                </ul>
              </div>
            ))}
          </div>
        )}
      </section>
      <ConfirmDialog
        open={!!removing}
        title="Delete this snippet?"
        confirmLabel="Delete"
        tone="danger"
        busy={remove.isPending}
        error={remove.isError ? remove.error.message : null}
        onClose={() => {
          setRemoving(null);
          remove.reset();
        }}
        onConfirm={() => removing && remove.mutate(removing.id, { onSuccess: () => setRemoving(null) })}
      >
        <p>Reviewers will no longer be offered it. Feedback already written keeps its words.</p>
        <p className="mt-2 rounded-md bg-paper-200 px-3 py-2 text-ink-900">{removing?.text}</p>
      </ConfirmDialog>
    </div>
  );
}
