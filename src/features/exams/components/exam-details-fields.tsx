// The details of an exam: application, when and where it was scanned, with what, why, and
// the sonographer's own read of each finding the chosen application asks about.
import { useId } from "react";
import { Controller, useWatch, type UseFormReturn } from "react-hook-form";
import type { Application } from "../../../../shared/schemas/applications";
import { FINDING_READS, SETTINGS, TRANSDUCERS, type FindingRead } from "../../../../shared/catalogue";
import type { ExamFieldsInput } from "../../../../shared/schemas/exams";
import { SelectField } from "../../../components/ui/select-field";
import { FieldError, TextField } from "../../../components/ui/text-field";
import { READ_LABELS, SETTING_HINTS, SETTING_LABELS, TRANSDUCER_LABELS } from "../../../lib/catalogue";
import { isoToLocalInput, localInputToIso } from "../../../lib/datetime-local";

export type ExamForm = UseFormReturn<ExamFieldsInput, unknown, unknown>;

const legend = "text-sm font-semibold text-ink-900";
const radioRow =
  "flex items-center gap-2 rounded-md border border-slate-300 bg-white px-3 py-1.5 text-sm text-ink-900 has-[:checked]:border-sea-600 has-[:checked]:bg-sea-50 has-[:checked]:font-semibold";

function FindingReads({ form, application }: { form: ExamForm; application: Application | undefined }) {
  const idBase = useId();
  if (!application) return <p className="text-sm text-slate-600">Choose an application to see the findings it asks about.</p>;
  if (application.findings.length === 0) return <p className="text-sm text-slate-600">This application asks about no findings.</p>;
  return (
    <Controller
      control={form.control}
      name="findings"
      render={({ field, fieldState }) => {
        const reads = new Map((field.value ?? []).map((f) => [f.key, f.read]));
        const set = (key: string, read: FindingRead) => {
          const next = application.findings.flatMap((f) => {
            const r = f.key === key ? read : reads.get(f.key);
            return r ? [{ key: f.key, read: r }] : [];
          });
          field.onChange(next);
        };
        return (
          <div className="space-y-3">
            {application.findings.map((finding, i) => (
              <fieldset key={finding.key} className="flex flex-wrap items-center justify-between gap-2 border-b border-slate-100 pb-3 last:border-b-0">
                <legend className="float-left text-sm text-ink-900">{finding.label}</legend>
                <div className="flex flex-wrap gap-1.5">
                  {FINDING_READS.map((read) => (
                    <label key={read} className={radioRow}>
                      <input
                        type="radio"
                        name={`${idBase}-finding-${i}`}
                        value={read}
                        checked={reads.get(finding.key) === read}
                        onChange={() => set(finding.key, read)}
                        onBlur={field.onBlur}
                        className="accent-sea-600"
                      />
                      {READ_LABELS[read]}
                    </label>
                  ))}
                </div>
              </fieldset>
            ))}
            <FieldError id={`${idBase}-findings-error`} message={fieldState.error?.message ?? fieldState.error?.root?.message} />
          </div>
        );
      }}
    />
  );
}

export function ExamDetailsFields({
  form,
  applications,
  hasEncounterRef = false,
}: {
  form: ExamForm;
  applications: Application[];
  /** The draft already keeps an encounter reference (sealed; never shown back). */
  hasEncounterRef?: boolean;
}) {
  const {
    register,
    control,
    setValue,
    getValues,
    formState: { errors },
  } = form;
  const indicationId = useId();
  const appCode = useWatch({ control, name: "applicationCode" });
  const setting = useWatch({ control, name: "setting" });
  const application = applications.find((a) => a.code === appCode);
  const usual = application?.usualTransducers.map((t) => TRANSDUCER_LABELS[t]).join(", ");
  const appField = register("applicationCode");

  return (
    <div className="space-y-6">
      <div className="grid gap-4 sm:grid-cols-2">
        <SelectField
          label="Application"
          error={errors.applicationCode?.message}
          {...appField}
          onChange={(e) => {
            void appField.onChange(e);
            // Reads of findings the new application does not ask about would be refused.
            const next = applications.find((a) => a.code === e.target.value);
            const keys = new Set(next?.findings.map((f) => f.key) ?? []);
            setValue(
              "findings",
              (getValues("findings") ?? []).filter((f) => keys.has(f.key)),
              { shouldDirty: true },
            );
          }}
        >
          <option value="">Choose an application</option>
          {applications
            .filter((a) => a.active || a.code === appCode)
            .map((a) => (
              <option key={a.code} value={a.code}>
                {a.name}
              </option>
            ))}
        </SelectField>
        <Controller
          control={control}
          name="performedAt"
          render={({ field, fieldState }) => (
            <TextField
              label="Performed at"
              type="datetime-local"
              hint="Your local time; not in the future."
              max={isoToLocalInput(new Date().toISOString())}
              value={isoToLocalInput(field.value)}
              onChange={(e) => field.onChange(localInputToIso(e.target.value))}
              onBlur={field.onBlur}
              name={field.name}
              ref={field.ref}
              error={fieldState.error?.message}
            />
          )}
        />
      </div>

      <fieldset aria-describedby="setting-hint setting-error">
        <legend className={legend}>Setting</legend>
        <ul id="setting-hint" className="mt-0.5 space-y-0.5 text-sm text-slate-600">
          {SETTINGS.map((s) => (
            <li key={s}>
              <span className="font-semibold text-slate-700">{SETTING_LABELS[s]}:</span> {SETTING_HINTS[s]}
            </li>
          ))}
        </ul>
        <div className="mt-1 flex flex-wrap gap-1.5">
          {SETTINGS.map((s) => (
            <label key={s} className={radioRow}>
              <input type="radio" value={s} className="accent-sea-600" {...register("setting")} />
              {SETTING_LABELS[s]}
            </label>
          ))}
        </div>
        <FieldError id="setting-error" message={errors.setting?.message} />
      </fieldset>

      <div className="grid gap-4 sm:grid-cols-2">
        <SelectField
          label="Transducer"
          hint={usual ? `Usual for this application: ${usual}.` : "The probe used for the scan."}
          error={errors.transducer?.message}
          {...register("transducer")}
        >
          <option value="">Choose the transducer</option>
          {TRANSDUCERS.map((t) => (
            <option key={t} value={t}>
              {TRANSDUCER_LABELS[t]}
              {application?.usualTransducers.includes(t) ? " (usual)" : ""}
            </option>
          ))}
        </SelectField>
        <TextField
          label="Preset"
          hint="As named on the machine, for example Abdomen or Cardiac."
          autoComplete="off"
          error={errors.preset?.message}
          {...register("preset")}
        />
      </div>

      <div>
        <label htmlFor={indicationId} className="block text-sm font-semibold text-ink-900">
          Indication
        </label>
        <p id={`${indicationId}-hint`} className="mt-0.5 text-sm text-slate-600">
          Why the scan was done, in a few words. No names, record numbers or dates of birth.
        </p>
        <textarea
          id={indicationId}
          rows={2}
          aria-describedby={`${indicationId}-hint${errors.indication ? ` ${indicationId}-error` : ""}`}
          aria-invalid={errors.indication ? true : undefined}
          className={
            "mt-1 block w-full rounded-md border bg-white px-3 py-2 text-base text-ink-950 focus-visible:outline-2 focus-visible:outline-offset-1 focus-visible:outline-sea-600 " +
            (errors.indication ? "border-coral-600" : "border-slate-400")
          }
          {...register("indication")}
        />
        <FieldError id={`${indicationId}-error`} message={errors.indication?.message} />
      </div>

      {setting === "clinical" ? (
        <TextField
          label="Encounter or accession reference (optional)"
          className="max-w-md"
          autoComplete="off"
          hint={
            hasEncounterRef
              ? "A reference is kept, sealed. Leave this empty to keep it, or type a new one to replace it."
              : "So the QA lead can find the patient if a callback is needed. Sealed when saved; only a QA lead can open it, on a follow-up."
          }
          error={errors.encounterRef?.message}
          {...register("encounterRef")}
        />
      ) : null}

      <section aria-labelledby="reads-heading">
        <h3 id="reads-heading" className={legend}>
          Your read of each finding
        </h3>
        <p className="mb-3 mt-0.5 text-sm text-slate-600">Record what you saw at the bedside; choose indeterminate when the images could not tell.</p>
        <FindingReads form={form} application={application} />
      </section>
    </div>
  );
}
