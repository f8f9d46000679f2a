// The form for one application of the catalogue: name, usual transducers, presets, typical
// depth, orientation convention, cautions, views (required or not, with a hint) and findings
// (with what makes them positive). It checks with the same schema the API uses and puts each
// refusal under its field; the API's own refusals (a taken code) are shown the same way.
import { useFieldArray, useForm, useWatch, type FieldPath } from "react-hook-form";
import { ArrowDown, ArrowUp, Plus, Trash2 } from "lucide-react";
import type { ZodError } from "zod";
import {
  applicationInputSchema,
  newApplicationSchema,
  type Application,
  type ApplicationInput,
  type NewApplicationInput,
} from "../../../../shared/schemas/applications";
import { ORIENTATIONS, TRANSDUCERS, type Orientation, type Transducer } from "../../../../shared/catalogue";
import { Button } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { FieldError, TextField } from "../../../components/ui/text-field";
import { SelectField } from "../../../components/ui/select-field";
import { ORIENTATION_LABELS, TRANSDUCER_LABELS } from "../../../lib/catalogue";
import { isApiError } from "../../../lib/api-errors";

export interface ApplicationFormValues {
  code: string;
  name: string;
  active: boolean;
  usualTransducers: Transducer[];
  /** Comma-separated. */
  presets: string;
  depthMin: string;
  depthMax: string;
  orientation: Orientation;
  /** One caution per line. */
  cautions: string;
  views: { key: string; label: string; required: boolean; hint: string }[];
  findings: { key: string; label: string; hint: string }[];
  /** Empty: the program's threshold. */
  creditThreshold: string;
  /** Empty: no cap. */
  nonClinicalCap: string;
  minPositive: string;
  requireComplete: boolean;
}

export function formValuesOf(app: Application | null): ApplicationFormValues {
  if (!app)
    return {
      code: "",
      name: "",
      active: true,
      usualTransducers: [],
      presets: "",
      depthMin: "",
      depthMax: "",
      orientation: "screen_left",
      cautions: "",
      views: [{ key: "", label: "", required: true, hint: "" }],
      findings: [],
      creditThreshold: "",
      nonClinicalCap: "",
      minPositive: "0",
      requireComplete: false,
    };
  return {
    code: app.code,
    name: app.name,
    active: app.active,
    usualTransducers: app.usualTransducers,
    presets: app.presets.join(", "),
    depthMin: String(app.typicalDepthCm[0]),
    depthMax: String(app.typicalDepthCm[1]),
    orientation: app.orientation,
    cautions: app.cautions.join("\n"),
    views: app.views.map((v) => ({ ...v })),
    findings: app.findings.map((f) => ({ ...f })),
    creditThreshold: app.creditRule.threshold === null ? "" : String(app.creditRule.threshold),
    nonClinicalCap: app.creditRule.nonClinicalCap === null ? "" : String(app.creditRule.nonClinicalCap),
    minPositive: String(app.creditRule.minPositive),
    requireComplete: app.creditRule.requireComplete,
  };
}

const number = (s: string) => (s.trim() === "" ? Number.NaN : Number(s.replace(",", ".")));
const lines = (s: string) =>
  s
    .split("\n")
    .map((x) => x.trim())
    .filter(Boolean);

/** The API body of the form's values (a new application also sends its code). */
export function bodyOf(values: ApplicationFormValues, isNew: boolean): ApplicationInput | NewApplicationInput {
  const body: ApplicationInput = {
    name: values.name,
    active: values.active,
    usualTransducers: values.usualTransducers,
    presets: values.presets
      .split(",")
      .map((x) => x.trim())
      .filter(Boolean),
    typicalDepthCm: [number(values.depthMin), number(values.depthMax)],
    orientation: values.orientation,
    cautions: lines(values.cautions),
    views: values.views,
    findings: values.findings,
    creditRule: {
      threshold: values.creditThreshold.trim() === "" ? null : number(values.creditThreshold),
      nonClinicalCap: values.nonClinicalCap.trim() === "" ? null : number(values.nonClinicalCap),
      minPositive: values.minPositive.trim() === "" ? 0 : number(values.minPositive),
      requireComplete: values.requireComplete,
    },
  };
  return isNew ? { ...body, code: values.code } : body;
}

/** The form field an API or schema path belongs to ("typicalDepthCm.1" → depthMax, "presets.2" → presets). */
export function fieldOf(path: string): FieldPath<ApplicationFormValues> | "root" {
  if (path === "typicalDepthCm" || path === "typicalDepthCm.0") return "depthMin";
  if (path === "typicalDepthCm.1") return "depthMax";
  if (path === "creditRule.threshold") return "creditThreshold";
  if (path === "creditRule.nonClinicalCap") return "nonClinicalCap";
  if (path === "creditRule.minPositive") return "minPositive";
  const top = path.split(".")[0];
  if (top === "presets" || top === "cautions" || top === "usualTransducers") return top;
  if (/^(views|findings)\.\d+\.(key|label|hint)$/.test(path)) return path as FieldPath<ApplicationFormValues>;
  if (path === "views" || path === "findings" || path === "code" || path === "name") return path;
  return "root";
}

const slug = (label: string) =>
  label
    .toLowerCase()
    .normalize("NFKD")
    .replace(/[^a-z0-9]+/g, "_")
    .replace(/^_+|_+$/g, "")
    .slice(0, 60);

type Props = {
  application: Application | null;
  readOnly: boolean;
  busy: boolean;
  error: Error | null;
  onSubmit: (body: ApplicationInput | NewApplicationInput) => Promise<void>;
  onCancel: () => void;
};

export function ApplicationForm({ application, readOnly, busy, error, onSubmit, onCancel }: Props) {
  const isNew = !application;
  const form = useForm<ApplicationFormValues>({ defaultValues: formValuesOf(application) });
  const views = useFieldArray({ control: form.control, name: "views" });
  const findings = useFieldArray({ control: form.control, name: "findings" });
  const watched = useWatch({ control: form.control });
  const { errors } = form.formState;

  const showIssues = (issues: { path: string; message: string }[]) => {
    for (const issue of issues) {
      const field = fieldOf(issue.path);
      if (!form.getFieldState(field as FieldPath<ApplicationFormValues>).error)
        form.setError(field as FieldPath<ApplicationFormValues>, { message: issue.message });
    }
  };

  const submit = form.handleSubmit(async (values) => {
    form.clearErrors();
    const body = bodyOf(values, isNew);
    const parsed = (isNew ? newApplicationSchema : applicationInputSchema).safeParse(body);
    if (!parsed.success) {
      showIssues((parsed.error as ZodError).issues.map((i) => ({ path: i.path.join("."), message: i.message })));
      return;
    }
    try {
      await onSubmit(body);
    } catch (e) {
      if (isApiError(e) && Array.isArray(e.details)) showIssues(e.details as { path: string; message: string }[]);
    }
  });

  const rowButtons = (list: typeof views | typeof findings, i: number, what: string) => (
    <div className="flex gap-1">
      <Button variant="ghost" size="sm" disabled={readOnly || i === 0} onClick={() => list.move(i, i - 1)} aria-label={`Move ${what} ${i + 1} up`}>
        <ArrowUp aria-hidden="true" className="size-4" />
      </Button>
      <Button
        variant="ghost"
        size="sm"
        disabled={readOnly || i === list.fields.length - 1}
        onClick={() => list.move(i, i + 1)}
        aria-label={`Move ${what} ${i + 1} down`}
      >
        <ArrowDown aria-hidden="true" className="size-4" />
      </Button>
      <Button variant="ghost" size="sm" disabled={readOnly} onClick={() => list.remove(i)} aria-label={`Remove ${what} ${i + 1}`}>
        <Trash2 aria-hidden="true" className="size-4" />
        Remove
      </Button>
    </div>
  );

  /** Fills an empty key from the label when the label is left. */
  const keyFromLabel = (list: "views" | "findings", i: number) => () => {
    const key = form.getValues(`${list}.${i}.key`);
    const label = form.getValues(`${list}.${i}.label`);
    if (!key && label) form.setValue(`${list}.${i}.key`, slug(label));
  };

  return (
    <form onSubmit={submit} noValidate className="space-y-6">
      <fieldset disabled={readOnly} className="space-y-6">
        <section aria-labelledby="app-basics" className="space-y-4 rounded-lg border border-slate-200 bg-white p-5">
          <h2 id="app-basics" className="text-lg font-semibold text-ink-950">
            The application
          </h2>
          <div className="grid gap-4 sm:grid-cols-2">
            <TextField label="Name" error={errors.name?.message} {...form.register("name")} />
            {isNew ? (
              <TextField
                label="Code"
                hint="Lower-case letters, digits and underscores; it never changes."
                error={errors.code?.message}
                autoComplete="off"
                {...form.register("code")}
              />
            ) : (
              <div>
                <p className="text-sm font-semibold text-ink-900">Code</p>
                <p className="mt-2 font-mono text-sm text-ink-900">{application.code}</p>
              </div>
            )}
          </div>
          <fieldset aria-describedby="transducers-error">
            <legend className="text-sm font-semibold text-ink-900">Usual transducers</legend>
            <div className="mt-1 flex flex-wrap gap-4">
              {TRANSDUCERS.map((t) => (
                <label key={t} className="inline-flex items-center gap-2 text-sm text-ink-900">
                  <input type="checkbox" value={t} className="size-4 accent-sea-600" {...form.register("usualTransducers")} />
                  {TRANSDUCER_LABELS[t]}
                </label>
              ))}
            </div>
            <FieldError id="transducers-error" message={errors.usualTransducers?.message ?? errors.usualTransducers?.root?.message} />
          </fieldset>
          <TextField
            label="Presets"
            hint="Separate presets with commas, for example: Abdomen, Lung."
            error={errors.presets?.message}
            {...form.register("presets")}
          />
          <div className="grid gap-4 sm:grid-cols-[10rem_10rem_1fr]">
            <TextField label="Typical depth from (cm)" inputMode="decimal" error={errors.depthMin?.message} {...form.register("depthMin")} />
            <TextField label="to (cm)" inputMode="decimal" error={errors.depthMax?.message} {...form.register("depthMax")} />
            <p className="self-end pb-3 text-sm text-slate-600">A starting value for the depth hint, not a rule.</p>
          </div>
          <SelectField label="Orientation convention" hint="Shown to the reviewer beside the orientation criterion." {...form.register("orientation")}>
            {ORIENTATIONS.map((o) => (
              <option key={o} value={o}>
                {ORIENTATION_LABELS[o]}
              </option>
            ))}
          </SelectField>
          <div>
            <label htmlFor="app-cautions" className="block text-sm font-semibold text-ink-900">
              Cautions
            </label>
            <p id="app-cautions-hint" className="mt-0.5 text-sm text-slate-600">
              One per line. Shown on the exam, the feedback and the scoring screen.
            </p>
            <textarea
              id="app-cautions"
              rows={3}
              aria-describedby="app-cautions-hint app-cautions-error"
              aria-invalid={errors.cautions ? true : undefined}
              className={
                "mt-1 block w-full rounded-md border bg-white px-3 py-2 text-base text-ink-950 " + (errors.cautions ? "border-coral-600" : "border-slate-400")
              }
              {...form.register("cautions")}
            />
            <FieldError id="app-cautions-error" message={errors.cautions?.message} />
          </div>
          <label className="inline-flex items-center gap-2 text-sm text-ink-900">
            <input type="checkbox" className="size-4 accent-sea-600" {...form.register("active")} />
            Active: clinicians can record new exams of this application
          </label>
        </section>

        <section aria-labelledby="app-views" className="space-y-3 rounded-lg border border-slate-200 bg-white p-5">
          <h2 id="app-views" className="text-lg font-semibold text-ink-950">
            Views
          </h2>
          <p className="text-sm text-slate-600">A study is complete when it has every required view.</p>
          <FormMessage message={errors.views?.message ?? errors.views?.root?.message} />
          <ol className="space-y-3">
            {views.fields.map((field, i) => (
              <li key={field.id} className="rounded-md border border-slate-200 p-3">
                <div className="mb-2 flex flex-wrap items-center justify-between gap-2">
                  <h3 className="text-sm font-semibold text-ink-950">
                    View {i + 1}
                    {watched.views?.[i]?.label ? `: ${watched.views[i].label}` : ""}
                  </h3>
                  {rowButtons(views, i, "view")}
                </div>
                <div className="grid gap-3 sm:grid-cols-[1fr_14rem]">
                  <TextField
                    label="Label"
                    error={errors.views?.[i]?.label?.message}
                    {...form.register(`views.${i}.label`, { onBlur: keyFromLabel("views", i) })}
                  />
                  <TextField label="Key" autoComplete="off" error={errors.views?.[i]?.key?.message} {...form.register(`views.${i}.key`)} />
                  <TextField label="Hint" hint="What the view must include." error={errors.views?.[i]?.hint?.message} {...form.register(`views.${i}.hint`)} />
                  <label className="inline-flex items-center gap-2 self-end pb-3 text-sm text-ink-900">
                    <input type="checkbox" className="size-4 accent-sea-600" {...form.register(`views.${i}.required`)} />
                    Required
                  </label>
                </div>
              </li>
            ))}
          </ol>
          <Button
            variant="secondary"
            disabled={readOnly || views.fields.length >= 30}
            onClick={() => views.append({ key: "", label: "", required: true, hint: "" })}
          >
            <Plus aria-hidden="true" className="size-4" />
            Add view
          </Button>
        </section>

        <section aria-labelledby="app-findings" className="space-y-3 rounded-lg border border-slate-200 bg-white p-5">
          <h2 id="app-findings" className="text-lg font-semibold text-ink-950">
            Findings
          </h2>
          <p className="text-sm text-slate-600">
            What the clinician reads as positive, negative or indeterminate. Technique (a needle tip seen, a short pause) belongs on the rubric, not here.
          </p>
          <FormMessage message={errors.findings?.message ?? errors.findings?.root?.message} />
          {findings.fields.length === 0 ? <p className="text-sm text-slate-600">No findings: exams of this application are scored on technique only.</p> : null}
          <ol className="space-y-3">
            {findings.fields.map((field, i) => (
              <li key={field.id} className="rounded-md border border-slate-200 p-3">
                <div className="mb-2 flex flex-wrap items-center justify-between gap-2">
                  <h3 className="text-sm font-semibold text-ink-950">
                    Finding {i + 1}
                    {watched.findings?.[i]?.label ? `: ${watched.findings[i].label}` : ""}
                  </h3>
                  {rowButtons(findings, i, "finding")}
                </div>
                <div className="grid gap-3 sm:grid-cols-[1fr_14rem]">
                  <TextField
                    label="Label"
                    error={errors.findings?.[i]?.label?.message}
                    {...form.register(`findings.${i}.label`, { onBlur: keyFromLabel("findings", i) })}
                  />
                  <TextField label="Key" autoComplete="off" error={errors.findings?.[i]?.key?.message} {...form.register(`findings.${i}.key`)} />
                  <TextField
                    label="Hint"
                    hint="What makes it positive: a cut-off, what confirms it."
                    className="sm:col-span-2"
                    error={errors.findings?.[i]?.hint?.message}
                    {...form.register(`findings.${i}.hint`)}
                  />
                </div>
              </li>
            ))}
          </ol>
          <Button variant="secondary" disabled={readOnly || findings.fields.length >= 40} onClick={() => findings.append({ key: "", label: "", hint: "" })}>
            <Plus aria-hidden="true" className="size-4" />
            Add finding
          </Button>
        </section>
        <section aria-labelledby="app-credit" className="space-y-4 rounded-lg border border-slate-200 bg-white p-5">
          <h2 id="app-credit" className="text-lg font-semibold text-ink-950">
            Credit rule
          </h2>
          <p className="text-sm text-slate-600">
            How credited exams of this application count toward credentialing. Reports state this rule beside every count. A misread finding and a critical
            criterion at a failing level block credit on every setting.
          </p>
          <div className="grid gap-4 sm:grid-cols-3">
            <TextField
              label="Credited exams needed"
              hint="Empty: the program's threshold."
              inputMode="numeric"
              error={errors.creditThreshold?.message}
              {...form.register("creditThreshold")}
            />
            <TextField
              label="Educational and simulated exams counted, at most"
              hint="Empty: no cap."
              inputMode="numeric"
              error={errors.nonClinicalCap?.message}
              {...form.register("nonClinicalCap")}
            />
            <TextField
              label="Credited exams with a positive finding, at least"
              hint="0: no minimum."
              inputMode="numeric"
              error={errors.minPositive?.message}
              {...form.register("minPositive")}
            />
          </div>
          <label className="inline-flex items-center gap-2 text-sm text-ink-900">
            <input type="checkbox" className="size-4 accent-sea-600" {...form.register("requireComplete")} />
            Credit needs a clip of every required view
          </label>
        </section>
      </fieldset>
      <FormMessage message={errors.root?.message ?? (error ? error.message : null)} />
      {!readOnly ? (
        <div className="flex gap-2 border-t border-slate-200 pt-4">
          <Button type="submit" busy={busy}>
            {isNew ? "Add application" : `Save as version ${application.version + 1}`}
          </Button>
          <Button variant="ghost" onClick={onCancel}>
            Cancel
          </Button>
        </div>
      ) : null}
    </form>
  );
}
