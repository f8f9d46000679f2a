// Puts a server's 400 validation_failed field messages onto react-hook-form fields, so an
// error the client schema could not foresee still appears next to the right field.
import type { FieldValues, Path, UseFormSetError } from "react-hook-form";
import { fieldErrors } from "./api-client";

/** Returns true when at least one server field error matched a form field. */
export function applyServerFieldErrors<T extends FieldValues>(error: unknown, setError: UseFormSetError<T>, fields: readonly Path<T>[]): boolean {
  const errors = fieldErrors(error);
  let matched = false;
  for (const field of fields) {
    const message = errors[field];
    if (message) {
      setError(field, { type: "server", message }, { shouldFocus: !matched });
      matched = true;
    }
  }
  return matched;
}
