// The four roles as checkboxes in one fieldset, for the invite and change-roles forms.
import { useId } from "react";
import type { UseFormRegisterReturn } from "react-hook-form";
import { ROLES, ROLE_LABELS, type Role } from "../../../../shared/roles";
import { FieldError } from "../../../components/ui/text-field";

const ROLE_HINTS: Record<Role, string> = {
  sonographer: "Submits exams and reads feedback",
  reviewer: "Scores exams from the blinded queue",
  qa_lead: "Runs calibration, adjudication and reports",
  admin: "Manages people, settings and the audit log",
};

export function RoleCheckboxes({ registration, error, legend = "Roles" }: { registration: UseFormRegisterReturn; error?: string; legend?: string }) {
  const id = useId();
  const errorId = `${id}-error`;
  return (
    <fieldset aria-describedby={error ? errorId : undefined}>
      <legend className="text-sm font-semibold text-ink-900">{legend}</legend>
      <div className="mt-1 grid gap-1 sm:grid-cols-2">
        {ROLES.map((role) => (
          <label key={role} htmlFor={`${id}-${role}`} className="flex cursor-pointer items-start gap-2 rounded-md px-2 py-1.5 hover:bg-paper-200">
            <input
              id={`${id}-${role}`}
              type="checkbox"
              value={role}
              className="mt-1 size-4 accent-sea-600"
              aria-invalid={error ? true : undefined}
              {...registration}
            />
            <span>
              <span className="block text-sm font-semibold text-ink-900">{ROLE_LABELS[role]}</span>
              <span className="block text-xs text-slate-600">{ROLE_HINTS[role]}</span>
            </span>
          </label>
        ))}
      </div>
      <FieldError id={errorId} message={error} />
    </fieldset>
  );
}
