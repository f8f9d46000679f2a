// Setup → Program settings: the double-read share, blinding, turnaround targets, claim length,
// the patient follow-up targets and on-call address,
// the credentialing rule and the learning-curve (CUSUM) settings, each explained in plain
// words. Shares and rates are edited as percentages and stored as fractions.
import type { ComponentProps } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { z } from "zod";
import { programSettingsSchema, type ProgramSettings } from "../../../../shared/schemas/reviews";
import { Button } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { PageHeader } from "../../../components/ui/page-header";
import { ErrorState, LoadingState } from "../../../components/ui/states";
import { fieldErrors, isApiError, splitFieldMessage } from "../../../lib/api-errors";
import { TextField } from "../../../components/ui/text-field";
import { useSettings, useUpdateSettings } from "../api/settings";

const percent = (max: number) => z.number({ message: "Enter a percentage" }).gt(0, "Must be above 0%").lt(max, `Must be below ${max}%`);

const formSchema = programSettingsSchema
  .omit({ doubleReadShare: true, cusumAcceptableRate: true, cusumUnacceptableRate: true, cusumAlpha: true, cusumBeta: true })
  .extend({
    doubleReadPercent: z.number({ message: "Enter a percentage" }).min(0, "At least 0%").max(100, "At most 100%"),
    cusumAcceptablePercent: percent(100),
    cusumUnacceptablePercent: percent(100),
    cusumAlphaPercent: percent(50),
    cusumBetaPercent: percent(50),
  });
// "Unacceptable above acceptable" is the server's rule (PATCH answers 400 naming
// cusumUnacceptableRate); its message is shown next to the field, so the rule lives in one place.
type FormInput = z.input<typeof formSchema>;
type FormValues = z.output<typeof formSchema>;

/** A fraction as a percentage with at most one decimal (0.125 → 12.5). */
const toPercent = (fraction: number) => Math.round(fraction * 1000) / 10;

/** Settings stored as fractions and edited as percentages: server field → form field. */
const PERCENT_FIELDS = {
  doubleReadShare: "doubleReadPercent",
  cusumAcceptableRate: "cusumAcceptablePercent",
  cusumUnacceptableRate: "cusumUnacceptablePercent",
  cusumAlpha: "cusumAlphaPercent",
  cusumBeta: "cusumBetaPercent",
} as const satisfies Partial<Record<keyof ProgramSettings, keyof FormValues>>;
type PercentSetting = keyof typeof PERCENT_FIELDS;
const PERCENT_SETTINGS = Object.keys(PERCENT_FIELDS) as PercentSetting[];

const toForm = (settings: ProgramSettings): FormValues => {
  const out: Record<string, unknown> = { ...settings };
  for (const key of PERCENT_SETTINGS) {
    delete out[key];
    out[PERCENT_FIELDS[key]] = toPercent(settings[key]);
  }
  return out as FormValues;
};

const fromForm = (values: FormValues): Partial<ProgramSettings> => {
  const out: Record<string, unknown> = { ...values };
  for (const key of PERCENT_SETTINGS) {
    delete out[PERCENT_FIELDS[key]];
    out[key] = values[PERCENT_FIELDS[key]] / 100;
  }
  return out as Partial<ProgramSettings>;
};

/** Server field names (fractions) → the form's percentage fields, so a 400 lands next to the right input. */
const SERVER_FIELDS = {
  ...PERCENT_FIELDS,
  leaseMinutes: "leaseMinutes",
  turnaroundHours: "turnaroundHours",
  clinicalTurnaroundHours: "clinicalTurnaroundHours",
  followUpDueHours: "followUpDueHours",
  urgentFollowUpDueHours: "urgentFollowUpDueHours",
  onCallEmail: "onCallEmail",
  minQualityForCredit: "minQualityForCredit",
  credentialingThreshold: "credentialingThreshold",
} as const satisfies Record<string, keyof FormValues>;

/**
 * The field errors of a refused save, keyed by form field: from validation details when the
 * server sent them, else from a "field: text" message (lib/api-errors reads both).
 */
function serverFieldErrors(error: unknown): Partial<Record<keyof FormValues, string>> {
  const byField = fieldErrors(error);
  if (Object.keys(byField).length === 0 && isApiError(error, 400)) {
    const { field, text } = splitFieldMessage(error.message);
    if (field) byField[field] = text;
  }
  const out: Partial<Record<keyof FormValues, string>> = {};
  for (const [server, field] of Object.entries(SERVER_FIELDS)) if (byField[server]) out[field] = byField[server];
  return out;
}

function Toggle({ id, label, hint, ...input }: { id: string; label: string; hint: string } & ComponentProps<"input">) {
  return (
    <div className="flex items-start gap-3">
      <input id={id} type="checkbox" aria-describedby={`${id}-hint`} className="mt-1 size-4 accent-sea-600" {...input} />
      <div>
        <label htmlFor={id} className="text-sm font-semibold text-ink-900">
          {label}
        </label>
        <p id={`${id}-hint`} className="text-sm text-slate-600">
          {hint}
        </p>
      </div>
    </div>
  );
}

function SettingsForm({ settings }: { settings: ProgramSettings }) {
  const update = useUpdateSettings();
  const form = useForm<FormInput, unknown, FormValues>({ resolver: zodResolver(formSchema), defaultValues: toForm(settings) });
  const { errors } = form.formState;
  /** A number input bound to a form field, with its error next to it. */
  const numberField = (
    name: Exclude<keyof FormValues, "blindSonographer" | "showReviewerName" | "onCallEmail">,
    props: { label: string; hint: string; min?: number; max?: number; step?: number },
  ) => <TextField type="number" className="max-w-xs" {...props} error={errors[name]?.message} {...form.register(name, { valueAsNumber: true })} />;

  const onSubmit = form.handleSubmit(async (values) => {
    try {
      const saved = await update.mutateAsync(fromForm(values));
      form.reset(toForm(saved));
    } catch (error) {
      // A refusal that names a field goes next to it; anything else shows from update.error.
      const fields = serverFieldErrors(error);
      let first = true;
      for (const [field, message] of Object.entries(fields) as [keyof FormValues, string][]) {
        form.setError(field, { type: "server", message }, { shouldFocus: first });
        first = false;
      }
    }
  });
  const unplacedError = update.isError && Object.keys(serverFieldErrors(update.error)).length === 0 ? update.error.message : null;

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-6">
      <fieldset className="space-y-4 rounded-lg border border-slate-200 bg-white p-5">
        <legend className="px-1 text-lg font-semibold text-ink-950">Reading</legend>
        {numberField("doubleReadPercent", {
          label: "Exams read twice (%)",
          min: 0,
          max: 100,
          step: 1,
          hint: "The share of submitted exams that also get an independent second read by another reviewer, to keep reviewers calibrated. 20% is a common start.",
        })}
        {numberField("leaseMinutes", {
          label: "Claim length (minutes)",
          min: 1,
          hint: "How long a reviewer holds an exam they started. When it runs out unfinished, the exam goes back to the queue.",
        })}
        {numberField("clinicalTurnaroundHours", {
          label: "Turnaround target for clinical exams (hours)",
          min: 1,
          hint: "A patient may be waiting on these: clinical exams waiting longer count as overdue, and reviewers get a reminder e-mail about them.",
        })}
        {numberField("turnaroundHours", {
          label: "Turnaround target for educational and simulated exams (hours)",
          min: 1,
          hint: "Other work waiting longer than this counts as overdue, with the same reminder.",
        })}
      </fieldset>
      <fieldset className="space-y-4 rounded-lg border border-slate-200 bg-white p-5">
        <legend className="px-1 text-lg font-semibold text-ink-950">Patient follow-up</legend>
        <TextField
          type="email"
          className="max-w-md"
          label="On-call address for urgent flags"
          hint="When a reviewer flags a read as needing clinical follow-up now, the QA leads and this address are e-mailed at once. Leave empty for QA leads only."
          error={errors.onCallEmail?.message}
          {...form.register("onCallEmail")}
        />
        {numberField("urgentFollowUpDueHours", {
          label: "Urgent follow-ups are due within (hours)",
          min: 1,
          hint: "An urgent follow-up not closed by then is flagged overdue.",
        })}
        {numberField("followUpDueHours", {
          label: "Other follow-ups are due within (hours)",
          min: 1,
          hint: "A follow-up opened by a disagreement on the final read, not closed by then, is flagged overdue.",
        })}
      </fieldset>
      <fieldset className="space-y-4 rounded-lg border border-slate-200 bg-white p-5">
        <legend className="px-1 text-lg font-semibold text-ink-950">Blinding</legend>
        <Toggle
          id="blind-sonographer"
          label="Hide the clinician from reviewers"
          hint="Reviewers see an exam code instead of the clinician's name. Recommended, so scores are not swayed by who scanned."
          {...form.register("blindSonographer")}
        />
        <Toggle
          id="show-reviewer-name"
          label="Show reviewers' names to clinicians"
          hint='When off, clinicians see "Reviewer" on comments and answers instead of a name.'
          {...form.register("showReviewerName")}
        />
      </fieldset>
      <fieldset className="space-y-4 rounded-lg border border-slate-200 bg-white p-5">
        <legend className="px-1 text-lg font-semibold text-ink-950">Credentialing</legend>
        {numberField("minQualityForCredit", {
          label: "Minimum overall image quality for credit (1–5)",
          min: 1,
          max: 5,
          hint: "An exam counts toward credentialing only at this quality or above, with the orientation marker following convention and no clinically significant disagreement.",
        })}
        {numberField("credentialingThreshold", {
          label: "Credited exams needed per application",
          min: 1,
          hint: "How many credited exams of one application a clinician needs before they can be put forward for privileges in it.",
        })}
      </fieldset>
      <fieldset className="space-y-4 rounded-lg border border-slate-200 bg-white p-5" aria-describedby="cusum-about">
        <legend className="px-1 text-lg font-semibold text-ink-950">Learning curve</legend>
        <p id="cusum-about" className="max-w-prose text-sm text-slate-600">
          Each application&apos;s learning curve is a CUSUM over the clinician&apos;s reviewed exams in the order performed; an exam without credentialing
          credit counts as a failure. The defaults (acceptable 10%, unacceptable 20%, false alarm 10% and missed signal 10%, that is α = β = 0.10) are common
          practice in published learning-curve CUSUMs for procedures; set your own if your program&apos;s policy differs.
        </p>
        {numberField("cusumAcceptablePercent", {
          label: "Acceptable failure rate (%)",
          min: 0.1,
          max: 99.9,
          step: 0.1,
          hint: "The share of exams without credit that is still fine for a clinician performing acceptably. The curve signals the acceptable rate reached when a learner performs at or below it. Default 10%.",
        })}
        {numberField("cusumUnacceptablePercent", {
          label: "Unacceptable failure rate (%)",
          min: 0.1,
          max: 99.9,
          step: 0.1,
          hint: "The share of exams without credit that is too high; must be above the acceptable rate. The curve signals a problem when a learner performs at or above it. Default 20%.",
        })}
        {numberField("cusumAlphaPercent", {
          label: "False alarm chance, alpha (%)",
          min: 0.1,
          max: 49.9,
          step: 0.1,
          hint: "How often the curve may wrongly signal an unacceptable rate for a clinician who is in fact at the acceptable rate. Lower means more exams before any signal. Default 10% (0.10).",
        })}
        {numberField("cusumBetaPercent", {
          label: "Missed signal chance, beta (%)",
          min: 0.1,
          max: 49.9,
          step: 0.1,
          hint: "How often the curve may wrongly signal the acceptable rate reached for a clinician who is in fact at the unacceptable rate. Lower means more exams before that signal is signalled. Default 10% (0.10).",
        })}
      </fieldset>
      <FormMessage message={unplacedError} />
      <FormMessage
        tone="success"
        message={update.isSuccess && !form.formState.isDirty ? "Settings saved. They apply from now on; past results keep theirs." : null}
      />
      <div className="flex gap-2">
        <Button type="submit" busy={update.isPending} disabled={!form.formState.isDirty}>
          Save settings
        </Button>
        <Button variant="secondary" disabled={!form.formState.isDirty || update.isPending} onClick={() => form.reset(toForm(settings))}>
          Undo changes
        </Button>
      </div>
    </form>
  );
}

export default function ProgramSettingsPage() {
  const query = useSettings();
  return (
    <div className="max-w-3xl">
      <PageHeader
        eyebrow="Setup"
        title="Program settings"
        description="How the program reads, blinds and credits exams, and how learning curves judge progress. Changes apply to exams submitted or decided from now on."
      />
      {query.isPending ? (
        <LoadingState label="Loading the settings…" />
      ) : query.isError ? (
        <ErrorState error={query.error} onRetry={() => void query.refetch()} retrying={query.isFetching} />
      ) : (
        <SettingsForm settings={query.data} />
      )}
    </div>
  );
}
