// Handing an adjudication to a third reviewer: any active reviewer who did not read this
// exam. The server refuses the exam's own sonographer and the two readers with a reason.
import { useState } from "react";
import { useQuery } from "@tanstack/react-query";
import { Button } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { SelectField } from "../../../components/ui/select-field";
import { membersQuery } from "../../../lib/members";
import { useReassign, type Adjudication } from "../api/oversight";

export function ReassignPanel({ item }: { item: Adjudication }) {
  const members = useQuery(membersQuery);
  const reassign = useReassign();
  const [reviewerId, setReviewerId] = useState("");
  const readers = new Set(item.reads.map((r) => r.reviewer));
  const reviewers = (members.data?.members ?? []).filter((m) => m.active && m.roles.includes("reviewer") && !readers.has(m.name));
  const current = item.assignedTo ? members.data?.members.find((m) => m.id === item.assignedTo) : null;

  return (
    <section aria-labelledby="reassign-heading" className="rounded-lg border border-slate-200 bg-white p-4">
      <h2 id="reassign-heading" className="text-lg font-semibold text-ink-950">
        Hand to a third reviewer
      </h2>
      <p className="mt-1 text-sm text-slate-600">
        {current ? `Now handed to ${current.name}. ` : ""}The chosen reviewer sees both reads and sets the final result instead of you.
      </p>
      {members.isError ? (
        <FormMessage message="The reviewers could not be loaded." />
      ) : (
        <form
          className="mt-3 flex flex-wrap items-end gap-3"
          onSubmit={(e) => {
            e.preventDefault();
            if (reviewerId) reassign.mutate({ assignmentId: item.assignmentId, reviewerId });
          }}
        >
          <SelectField
            label="Reviewer"
            compact
            className="w-64"
            value={reviewerId}
            onChange={(e) => setReviewerId(e.target.value)}
            disabled={members.isPending}
          >
            <option value="">{members.isPending ? "Loading reviewers…" : "Choose a reviewer"}</option>
            {reviewers.map((m) => (
              <option key={m.id} value={m.id}>
                {m.name}
              </option>
            ))}
          </SelectField>
          <Button type="submit" variant="secondary" disabled={!reviewerId} busy={reassign.isPending}>
            Hand over
          </Button>
        </form>
      )}
      <div className="mt-2">
        <FormMessage message={reassign.isError ? reassign.error.message : null} />
        <FormMessage tone="success" message={reassign.isSuccess ? "Handed over. The reviewer finds it under Adjudication." : null} />
      </div>
    </section>
  );
}
