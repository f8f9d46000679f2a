// A labelled text input with hint and error text tied to it by aria-describedby, so a
// screen reader hears the error when the field gets focus after a failed submit.
import { useId, type ComponentProps, type ReactNode } from "react";

type TextFieldProps = ComponentProps<"input"> & {
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
};

export function TextField({ label, hint, error, id, className = "", ...input }: TextFieldProps) {
  const autoId = useId();
  const inputId = id ?? autoId;
  const hintId = `${inputId}-hint`;
  const errorId = `${inputId}-error`;
  const describedBy = [hint ? hintId : null, error ? errorId : null].filter(Boolean).join(" ") || undefined;
  return (
    <div className={className}>
      <label htmlFor={inputId} className="block text-sm font-semibold text-ink-900">
        {label}
      </label>
      {hint ? (
        <p id={hintId} className="mt-0.5 text-sm text-slate-600">
          {hint}
        </p>
      ) : null}
      <input
        id={inputId}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy}
        className={
          "mt-1 block w-full rounded-md border bg-white px-3 py-2 text-base text-ink-950 placeholder:text-slate-500 " +
          "focus-visible:outline-2 focus-visible:outline-offset-1 focus-visible:outline-sea-600 " +
          (error ? "border-coral-600" : "border-slate-400")
        }
        {...input}
      />
      <FieldError id={errorId} message={error} />
    </div>
  );
}

/** The error line under a field; a live region so it is announced when it appears. */
export function FieldError({ id, message }: { id: string; message?: string }) {
  return (
    <p id={id} aria-live="polite" className="mt-1 text-sm text-coral-700 empty:mt-0">
      {message ? (
        <>
          <span aria-hidden="true">⚠ </span>
          {message}
        </>
      ) : null}
    </p>
  );
}
