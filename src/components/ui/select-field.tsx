// A labelled <select> with hint and error tied to it, matching TextField's look.
import { useId, type ComponentProps, type ReactNode } from "react";
import { FieldError } from "./text-field";

type SelectFieldProps = ComponentProps<"select"> & {
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  /** Hides the label visually (it stays for assistive technology). */
  hideLabel?: boolean;
  compact?: boolean;
};

export function SelectField({ label, hint, error, id, className = "", hideLabel = false, compact = false, children, ...select }: SelectFieldProps) {
  const autoId = useId();
  const selectId = id ?? autoId;
  const hintId = `${selectId}-hint`;
  const errorId = `${selectId}-error`;
  const describedBy = [hint ? hintId : null, error ? errorId : null].filter(Boolean).join(" ") || undefined;
  return (
    <div className={className}>
      <label htmlFor={selectId} className={hideLabel ? "sr-only" : "block text-sm font-semibold text-ink-900"}>
        {label}
      </label>
      {hint ? (
        <p id={hintId} className="mt-0.5 text-sm text-slate-600">
          {hint}
        </p>
      ) : null}
      <select
        id={selectId}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy}
        className={
          `${hideLabel ? "" : "mt-1 "}block w-full rounded-md border bg-white text-ink-950 ` +
          (compact ? "px-2 py-1 text-sm " : "px-3 py-2 text-base ") +
          "focus-visible:outline-2 focus-visible:outline-offset-1 focus-visible:outline-sea-600 " +
          (error ? "border-coral-600" : "border-slate-400")
        }
        {...select}
      >
        {children}
      </select>
      <FieldError id={errorId} message={error} />
    </div>
  );
}
