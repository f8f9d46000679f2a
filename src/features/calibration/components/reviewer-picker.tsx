// Choosing who takes part in a calibration set: the program's active reviewers, all ticked
// until the QA lead narrows the choice.
import { useId } from "react";
import { useQuery } from "@tanstack/react-query";
import { FieldError } from "../../../components/ui/text-field";
import { ErrorState, LoadingState } from "../../../components/ui/states";
import { membersQuery } from "../../../lib/members";
import type { ProgramMember } from "../api/calibration";

/** Active members holding the reviewer role, by name. */
export function activeReviewers(members: ProgramMember[] | undefined): ProgramMember[] {
  return (members ?? []).filter((m) => m.active && m.roles.includes("reviewer")).sort((a, b) => a.name.localeCompare(b.name));
}

export function ReviewerPicker({
  chosen,
  onToggle,
  error,
}: {
  /** Ticked reviewer ids; null means every reviewer (the default). */
  chosen: ReadonlySet<string> | null;
  onToggle: (reviewerId: string, on: boolean, all: string[]) => void;
  error?: string;
}) {
  const id = useId();
  const errorId = `${id}-error`;
  const members = useQuery(membersQuery);
  const reviewers = activeReviewers(members.data?.members);
  const allIds = reviewers.map((r) => r.id);

  return (
    <fieldset aria-describedby={error ? errorId : undefined}>
      <legend className="text-sm font-semibold text-ink-900">Reviewers</legend>
      <p className="text-sm text-slate-600">Every active reviewer by default. A reviewer is never sent their own exam as a clinician.</p>
      {members.isPending ? (
        <LoadingState label="Loading reviewers…" />
      ) : members.isError ? (
        <div className="mt-2">
          <ErrorState error={members.error} onRetry={() => void members.refetch()} retrying={members.isFetching} />
        </div>
      ) : reviewers.length === 0 ? (
        <p className="mt-2 text-sm text-slate-600">No active reviewers in the program. Give people the reviewer role in Setup → People.</p>
      ) : (
        <div className="mt-1 grid gap-1 sm:grid-cols-2">
          {reviewers.map((r) => (
            <label key={r.id} htmlFor={`${id}-${r.id}`} className="flex cursor-pointer items-start gap-2 rounded-md px-2 py-1.5 hover:bg-paper-200">
              <input
                id={`${id}-${r.id}`}
                type="checkbox"
                className="mt-1 size-4 accent-sea-600"
                checked={chosen === null || chosen.has(r.id)}
                onChange={(e) => onToggle(r.id, e.target.checked, allIds)}
                aria-invalid={error ? true : undefined}
              />
              <span>
                <span className="block text-sm font-semibold text-ink-900">{r.name}</span>
                <span className="block text-xs text-slate-600">{r.email}</span>
              </span>
            </label>
          ))}
        </div>
      )}
      <FieldError id={errorId} message={error} />
    </fieldset>
  );
}
