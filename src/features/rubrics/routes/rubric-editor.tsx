// Setup → Rubrics → one rubric: edit the name and criteria (with levels), preview them as a
// reviewer will see them, and save. A draft changes in place; saving a rubric in use creates
// its next version, and past reviews keep theirs. Archived versions are read-only.
import { useState } from "react";
import { Link, useLocation, useNavigate, useParams } from "react-router-dom";
import { useFieldArray, useForm, useWatch, type Resolver } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { useQuery } from "@tanstack/react-query";
import { ArrowDown, ArrowUp, Plus, Trash2 } from "lucide-react";
import { rubricInputSchema, type Rubric, type RubricInput } from "../../../../shared/rubric/types";
import { Button } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { PageHeader } from "../../../components/ui/page-header";
import { ErrorState, LoadingState } from "../../../components/ui/states";
import { StatusTag } from "../../../components/ui/status-tag";
import { TextField } from "../../../components/ui/text-field";
import { applicationsQuery } from "../../../lib/catalogue";
import { rubricQuery, STATUS_WORDS, useSaveRubric } from "../api/rubrics";
import { CriterionFields } from "../components/criterion-fields";
import { RubricPreview } from "../components/rubric-preview";

const blankCriterion = (): RubricInput["criteria"][number] => ({
  key: "",
  label: "",
  help: "",
  kind: "ordinal",
  levels: [
    { value: "", label: "", anchor: "", fails: false, ideal: false },
    { value: "", label: "", anchor: "", fails: false, ideal: false },
  ],
  min: null,
  max: null,
  required: true,
  critical: false,
  tolerance: 0,
  applications: [],
});

function RubricForm({ rubric }: { rubric: Rubric | null }) {
  const navigate = useNavigate();
  const apps = useQuery(applicationsQuery);
  const save = useSaveRubric();
  const [preview, setPreview] = useState(false);
  const readOnly = rubric?.status === "archived";
  const form = useForm<RubricInput>({
    // The schema's output only fills defaults the form already holds, so input and output agree.
    resolver: zodResolver(rubricInputSchema) as unknown as Resolver<RubricInput>,
    defaultValues: rubric ? { name: rubric.name, criteria: rubric.criteria } : { name: "", criteria: [blankCriterion()] },
  });
  const criteria = useFieldArray({ control: form.control, name: "criteria" });
  const watched = useWatch({ control: form.control }) as RubricInput;
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit(async (body) => {
    try {
      const saved = await save.mutateAsync({ id: rubric?.id, body });
      const notice =
        rubric?.status === "published"
          ? `Saved as version ${saved.version}, now in use. Version ${rubric.version} is archived; its reviews keep it.`
          : rubric
            ? "Draft saved."
            : "Draft created. Publish it when it is ready.";
      navigate(`/setup/rubrics/${saved.id}`, { replace: !!rubric && saved.id === rubric.id, state: { notice } });
      form.reset({ name: saved.name, criteria: saved.criteria });
    } catch {
      // Shown from save.error.
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-6">
      <div className="rounded-lg border border-sand-200 bg-sand-50 px-4 py-3 text-sm text-ink-900">
        {rubric?.status === "published"
          ? `This version is in use. Saving creates version ${rubric.version + 1} and archives this one; reviews already made keep version ${rubric.version}.`
          : rubric?.status === "archived"
            ? "This version is archived and cannot change. Reviews made under it keep it."
            : "A draft changes in place until it is published. Publishing makes it the version new reviews are scored under."}
      </div>
      <fieldset disabled={readOnly} className="space-y-6">
        <TextField label="Rubric name" className="max-w-lg" error={errors.name?.message} {...form.register("name")} />
        <section aria-labelledby="criteria-heading" className="space-y-4">
          <div className="flex flex-wrap items-center justify-between gap-3">
            <h2 id="criteria-heading" className="text-lg font-semibold text-ink-950">
              Criteria, in the order reviewers see them
            </h2>
            <Button variant="secondary" onClick={() => setPreview((p) => !p)} aria-expanded={preview} aria-controls="rubric-preview">
              {preview ? "Hide preview" : "Preview as a reviewer"}
            </Button>
          </div>
          <FormMessage message={errors.criteria?.message ?? errors.criteria?.root?.message} />
          {preview ? (
            <div id="rubric-preview">
              <RubricPreview value={watched} />
            </div>
          ) : null}
          <ol className="space-y-4">
            {criteria.fields.map((field, i) => (
              <li key={field.id} className="rounded-lg border border-slate-200 bg-white p-4">
                <div className="mb-3 flex flex-wrap items-center justify-between gap-2">
                  <h3 className="font-semibold text-ink-950">
                    {i + 1}. {watched.criteria?.[i]?.label || "New criterion"}
                  </h3>
                  <div className="flex gap-1">
                    <Button variant="ghost" size="sm" disabled={i === 0} onClick={() => criteria.move(i, i - 1)} aria-label={`Move criterion ${i + 1} up`}>
                      <ArrowUp aria-hidden="true" className="size-4" />
                    </Button>
                    <Button
                      variant="ghost"
                      size="sm"
                      disabled={i === criteria.fields.length - 1}
                      onClick={() => criteria.move(i, i + 1)}
                      aria-label={`Move criterion ${i + 1} down`}
                    >
                      <ArrowDown aria-hidden="true" className="size-4" />
                    </Button>
                    <Button variant="ghost" size="sm" onClick={() => criteria.remove(i)} aria-label={`Remove criterion ${i + 1}`}>
                      <Trash2 aria-hidden="true" className="size-4" />
                      Remove
                    </Button>
                  </div>
                </div>
                <CriterionFields
                  index={i}
                  control={form.control}
                  register={form.register}
                  errors={errors}
                  applications={apps.data?.applications ?? []}
                  disabled={readOnly}
                />
              </li>
            ))}
          </ol>
          <Button variant="secondary" onClick={() => criteria.append(blankCriterion())} disabled={criteria.fields.length >= 40}>
            <Plus aria-hidden="true" className="size-4" />
            Add criterion
          </Button>
        </section>
      </fieldset>
      <FormMessage message={save.isError ? save.error.message : null} />
      {!readOnly ? (
        <div className="flex gap-2 border-t border-slate-200 pt-4">
          <Button type="submit" busy={save.isPending}>
            {rubric?.status === "published" ? "Save as the next version" : rubric ? "Save draft" : "Create draft"}
          </Button>
          <Link to="/setup/rubrics" className="rounded-md px-4 py-2 text-sm font-semibold text-sea-700 hover:bg-sea-50">
            Back to rubrics
          </Link>
        </div>
      ) : null}
    </form>
  );
}

export default function RubricEditorPage() {
  const { id } = useParams();
  const query = useQuery({ ...rubricQuery(id ?? ""), enabled: !!id });
  const rubric = id ? query.data : null;
  const location = useLocation();
  const notice = (location.state as { notice?: string } | null)?.notice ?? null;

  return (
    <div>
      <PageHeader
        eyebrow="Setup · Rubrics"
        title={!id ? "New rubric" : rubric ? `${rubric.name}, version ${rubric.version}` : "Rubric"}
        actions={
          rubric ? (
            <StatusTag tone={rubric.status === "published" ? "good" : rubric.status === "draft" ? "waiting" : "off"}>{STATUS_WORDS[rubric.status]}</StatusTag>
          ) : undefined
        }
      />
      {notice ? (
        <div className="mb-4">
          <FormMessage tone="success" message={notice} />
        </div>
      ) : null}
      {id && query.isPending ? (
        <LoadingState label="Loading the rubric…" />
      ) : id && query.isError ? (
        <ErrorState error={query.error} onRetry={() => void query.refetch()} retrying={query.isFetching} />
      ) : (
        <RubricForm key={rubric?.id ?? "new"} rubric={rubric ?? null} />
      )}
    </div>
  );
}
