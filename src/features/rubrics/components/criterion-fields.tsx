// One criterion in the rubric editor: its fields and its levels (a nested field array).
import { useFieldArray, useWatch, type Control, type FieldErrors, type UseFormRegister } from "react-hook-form";
import { Plus, Trash2 } from "lucide-react";
import { CRITERION_KINDS, type RubricInput } from "../../../../shared/rubric/types";
import type { Application } from "../../../../shared/schemas/applications";
import { Button } from "../../../components/ui/button";
import { FieldError } from "../../../components/ui/text-field";

const KIND_WORDS = { ordinal: "Ordered scale", choice: "Choice list", yes_no: "Yes / no", number: "Number" } as const;
const input =
  "mt-1 block w-full rounded-md border border-slate-400 bg-white px-2 py-1 text-sm text-ink-950 focus-visible:outline-2 focus-visible:outline-offset-1 focus-visible:outline-sea-600";
const labelCls = "block text-xs font-semibold text-ink-900";

type Props = {
  index: number;
  control: Control<RubricInput>;
  register: UseFormRegister<RubricInput>;
  errors: FieldErrors<RubricInput>;
  applications: Application[];
  disabled: boolean;
};

const nullableNumber = { setValueAs: (v: unknown) => (v === "" || v === null || v === undefined ? null : Number(v)) };

export function CriterionFields({ index, control, register, errors, applications, disabled }: Props) {
  const levels = useFieldArray({ control, name: `criteria.${index}.levels` });
  const kind = useWatch({ control, name: `criteria.${index}.kind` });
  const e = errors.criteria?.[index];
  const id = (name: string) => `c${index}-${name}`;

  return (
    <div className="space-y-3">
      <div className="grid gap-3 sm:grid-cols-3">
        <div>
          <label htmlFor={id("key")} className={labelCls}>
            Key
          </label>
          <input id={id("key")} className={`${input} font-mono`} aria-describedby={id("key-error")} {...register(`criteria.${index}.key`)} />
          <FieldError id={id("key-error")} message={e?.key?.message} />
        </div>
        <div>
          <label htmlFor={id("label")} className={labelCls}>
            Label
          </label>
          <input id={id("label")} className={input} aria-describedby={id("label-error")} {...register(`criteria.${index}.label`)} />
          <FieldError id={id("label-error")} message={e?.label?.message} />
        </div>
        <div>
          <label htmlFor={id("kind")} className={labelCls}>
            Kind
          </label>
          <select id={id("kind")} className={input} {...register(`criteria.${index}.kind`)}>
            {CRITERION_KINDS.map((k) => (
              <option key={k} value={k}>
                {KIND_WORDS[k]}
              </option>
            ))}
          </select>
        </div>
      </div>
      <div>
        <label htmlFor={id("help")} className={labelCls}>
          Help for reviewers
        </label>
        <textarea id={id("help")} rows={2} className={input} {...register(`criteria.${index}.help`)} />
      </div>
      <div className="flex flex-wrap items-end gap-4">
        <label className="inline-flex items-center gap-2 text-sm text-ink-900">
          <input type="checkbox" className="size-4 accent-sea-600" {...register(`criteria.${index}.required`)} />
          Required
        </label>
        <label className="inline-flex items-center gap-2 text-sm text-ink-900">
          <input type="checkbox" className="size-4 accent-sea-600" {...register(`criteria.${index}.critical`)} />
          Critical (a failing level blocks credit)
        </label>
        <div className="w-40">
          <label htmlFor={id("tolerance")} className={labelCls}>
            Double-read tolerance
          </label>
          <input
            id={id("tolerance")}
            type="number"
            min={0}
            step={1}
            className={input}
            aria-describedby={id("tolerance-hint")}
            {...register(`criteria.${index}.tolerance`, { valueAsNumber: true })}
          />
        </div>
        <p id={id("tolerance-hint")} className="max-w-xs text-xs text-slate-600">
          How many steps two reads may differ and still agree; 0 means they must match.
        </p>
        {kind === "number" ? (
          <>
            <div className="w-28">
              <label htmlFor={id("min")} className={labelCls}>
                Lowest
              </label>
              <input id={id("min")} type="number" className={input} {...register(`criteria.${index}.min`, nullableNumber)} />
            </div>
            <div className="w-28">
              <label htmlFor={id("max")} className={labelCls}>
                Highest
              </label>
              <input id={id("max")} type="number" className={input} aria-describedby={id("max-error")} {...register(`criteria.${index}.max`, nullableNumber)} />
              <FieldError id={id("max-error")} message={e?.max?.message} />
            </div>
          </>
        ) : null}
      </div>
      <fieldset>
        <legend className={labelCls}>Applies to (none ticked: every application)</legend>
        <div className="mt-1 flex flex-wrap gap-x-4 gap-y-1">
          {applications.map((a) => (
            <label key={a.code} className="inline-flex items-center gap-1.5 text-sm text-ink-900">
              <input type="checkbox" value={a.code} className="size-4 accent-sea-600" {...register(`criteria.${index}.applications`)} />
              {a.name}
            </label>
          ))}
        </div>
      </fieldset>
      {kind !== "number" ? (
        <fieldset className="rounded-md border border-slate-200 p-3">
          <legend className="px-1 text-sm font-semibold text-ink-900">Levels, in order</legend>
          <FieldError id={id("levels-error")} message={e?.levels?.message ?? e?.levels?.root?.message} />
          <ol className="space-y-3">
            {levels.fields.map((field, j) => {
              const le = e?.levels?.[j];
              const lid = (n: string) => id(`l${j}-${n}`);
              return (
                <li key={field.id} className="grid gap-2 border-b border-slate-100 pb-3 last:border-0 sm:grid-cols-[8rem_12rem_1fr_auto]">
                  <div>
                    <label htmlFor={lid("value")} className={labelCls}>
                      Level {j + 1} value
                    </label>
                    <input
                      id={lid("value")}
                      className={`${input} font-mono`}
                      aria-describedby={lid("value-error")}
                      {...register(`criteria.${index}.levels.${j}.value`)}
                    />
                    <FieldError id={lid("value-error")} message={le?.value?.message} />
                  </div>
                  <div>
                    <label htmlFor={lid("label")} className={labelCls}>
                      Level {j + 1} label
                    </label>
                    <input id={lid("label")} className={input} aria-describedby={lid("label-error")} {...register(`criteria.${index}.levels.${j}.label`)} />
                    <FieldError id={lid("label-error")} message={le?.label?.message} />
                  </div>
                  <div>
                    <label htmlFor={lid("anchor")} className={labelCls}>
                      Level {j + 1} anchor text
                    </label>
                    <textarea id={lid("anchor")} rows={2} className={input} {...register(`criteria.${index}.levels.${j}.anchor`)} />
                    <div className="mt-1 flex gap-4">
                      <label className="inline-flex items-center gap-1.5 text-xs text-ink-900">
                        <input type="checkbox" className="size-4 accent-sea-600" {...register(`criteria.${index}.levels.${j}.ideal`)} />
                        Target level
                      </label>
                      <label className="inline-flex items-center gap-1.5 text-xs text-ink-900">
                        <input type="checkbox" className="size-4 accent-sea-600" {...register(`criteria.${index}.levels.${j}.fails`)} />
                        Fails (blocks credit if critical)
                      </label>
                    </div>
                  </div>
                  <div className="self-center">
                    <Button variant="ghost" size="sm" disabled={disabled} onClick={() => levels.remove(j)} aria-label={`Remove level ${j + 1}`}>
                      <Trash2 aria-hidden="true" className="size-4" />
                    </Button>
                  </div>
                </li>
              );
            })}
          </ol>
          <Button
            variant="secondary"
            size="sm"
            className="mt-2"
            disabled={disabled || levels.fields.length >= 10}
            onClick={() => levels.append({ value: "", label: "", anchor: "", fails: false, ideal: false })}
          >
            <Plus aria-hidden="true" className="size-4" />
            Add level
          </Button>
        </fieldset>
      ) : null}
    </div>
  );
}
