// Setup → Program settings: the double-read share, blinding, turnaround target, claim length
// and the credentialing rule, each explained in plain words. The double-read share is edited
// as a percentage and stored as a fraction.
import type { ComponentProps } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { z } from "zod";
import { programSettingsSchema, type ProgramSettings } from "../../../../shared/schemas/reviews";
import { Button } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { PageHeader } from "../../../components/ui/page-header";
import { ErrorState, LoadingState } from "../../../components/ui/states";
import { TextField } from "../../../components/ui/text-field";
import { useSettings, useUpdateSettings } from "../api/settings";

const formSchema = programSettingsSchema.omit({ doubleReadShare: true }).extend({
  doubleReadPercent: z.number({ message: "Enter a percentage" }).min(0, "At least 0%").max(100, "At most 100%"),
});
type FormInput = z.input<typeof formSchema>;
type FormValues = z.output<typeof formSchema>;

const toForm = ({ doubleReadShare, ...rest }: ProgramSettings): FormValues => ({ ...rest, doubleReadPercent: Math.round(doubleReadShare * 1000) / 10 });

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
  const num = { valueAsNumber: true } as const;

  const onSubmit = form.handleSubmit(async ({ doubleReadPercent, ...rest }) => {
    try {
      const saved = await update.mutateAsync({ ...rest, doubleReadShare: doubleReadPercent / 100 });
      form.reset(toForm(saved));
    } catch {
      // Shown from update.error.
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-6">
      <fieldset className="space-y-4 rounded-lg border border-slate-200 bg-white p-5">
        <legend className="px-1 text-lg font-semibold text-ink-950">Reading</legend>
        <TextField
          label="Exams read twice (%)"
          type="number"
          min={0}
          max={100}
          step={1}
          className="max-w-xs"
          hint="The share of submitted exams that also get an independent second read by another reviewer, to keep reviewers calibrated. 20% is a common start."
          error={errors.doubleReadPercent?.message}
          {...form.register("doubleReadPercent", num)}
        />
        <TextField
          label="Claim length (minutes)"
          type="number"
          min={1}
          className="max-w-xs"
          hint="How long a reviewer holds an exam they started. When it runs out unfinished, the exam goes back to the queue."
          error={errors.leaseMinutes?.message}
          {...form.register("leaseMinutes", num)}
        />
        <TextField
          label="Turnaround target (hours)"
          type="number"
          min={1}
          className="max-w-xs"
          hint="Work waiting longer than this counts as overdue, and reviewers get a reminder e-mail about it."
          error={errors.turnaroundHours?.message}
          {...form.register("turnaroundHours", num)}
        />
      </fieldset>
      <fieldset className="space-y-4 rounded-lg border border-slate-200 bg-white p-5">
        <legend className="px-1 text-lg font-semibold text-ink-950">Blinding</legend>
        <Toggle
          id="blind-sonographer"
          label="Hide the sonographer from reviewers"
          hint="Reviewers see an exam code instead of the sonographer's name. Recommended, so scores are not swayed by who scanned."
          {...form.register("blindSonographer")}
        />
        <Toggle
          id="show-reviewer-name"
          label="Show reviewers' names to sonographers"
          hint='When off, sonographers see "Reviewer" on comments and answers instead of a name.'
          {...form.register("showReviewerName")}
        />
      </fieldset>
      <fieldset className="space-y-4 rounded-lg border border-slate-200 bg-white p-5">
        <legend className="px-1 text-lg font-semibold text-ink-950">Credentialing</legend>
        <TextField
          label="Minimum overall image quality for credit (1–5)"
          type="number"
          min={1}
          max={5}
          className="max-w-xs"
          hint="An exam counts toward credentialing only at this quality or above, with the orientation marker following convention and no clinically significant disagreement."
          error={errors.minQualityForCredit?.message}
          {...form.register("minQualityForCredit", num)}
        />
        <TextField
          label="Credited exams needed per application"
          type="number"
          min={1}
          className="max-w-xs"
          hint="How many credited exams of one application a sonographer needs before they can be put forward for privileges in it."
          error={errors.credentialingThreshold?.message}
          {...form.register("credentialingThreshold", num)}
        />
      </fieldset>
      <FormMessage message={update.isError ? update.error.message : null} />
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
        description="How the program reads, blinds and credits exams. Changes apply to exams submitted or decided from now on."
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
