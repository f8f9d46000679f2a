// Changing a follow-up's status with a note (what was done: patient called back, no action).
import { useState } from "react";
import { Button } from "../../../components/ui/button";
import { Dialog } from "../../../components/ui/dialog";
import { FormMessage } from "../../../components/ui/form-message";
import { FOLLOW_UP_WORDS, useUpdateFollowUp, type FollowUp, type FollowUpStatus } from "../api/oversight";

export function FollowUpDialog({ followUp, onClose }: { followUp: FollowUp | null; onClose: () => void }) {
  return (
    <Dialog open={!!followUp} title={followUp ? `Follow-up on ${followUp.examCode}` : "Follow-up"} onClose={onClose}>
      {followUp ? <FollowUpForm key={followUp.id} followUp={followUp} onClose={onClose} /> : null}
    </Dialog>
  );
}

function FollowUpForm({ followUp, onClose }: { followUp: FollowUp; onClose: () => void }) {
  const update = useUpdateFollowUp();
  const [status, setStatus] = useState<FollowUpStatus>(followUp.status === "open" ? "in_progress" : followUp.status);
  const [note, setNote] = useState(followUp.note ?? "");
  return (
    <form
      onSubmit={(e) => {
        e.preventDefault();
        update.mutate({ id: followUp.id, status, note }, { onSuccess: onClose });
      }}
      className="space-y-4"
    >
      <p className="text-sm text-slate-700">{followUp.reason}</p>
      <fieldset>
        <legend className="text-sm font-semibold text-ink-900">Status</legend>
        <div className="mt-1 flex flex-wrap gap-4">
          {(Object.keys(FOLLOW_UP_WORDS) as FollowUpStatus[]).map((s) => (
            <label key={s} className="inline-flex items-center gap-2 text-sm text-ink-900">
              <input type="radio" name="follow-up-status" value={s} checked={status === s} onChange={() => setStatus(s)} className="size-4 accent-sea-600" />
              {FOLLOW_UP_WORDS[s]}
            </label>
          ))}
        </div>
      </fieldset>
      <div>
        <label htmlFor="follow-up-note" className="block text-sm font-semibold text-ink-900">
          Note
        </label>
        <p id="follow-up-note-hint" className="text-sm text-slate-600">
          What was done, for example whether the patient was called back.
        </p>
        <textarea
          id="follow-up-note"
          rows={3}
          maxLength={2000}
          value={note}
          onChange={(e) => setNote(e.target.value)}
          aria-describedby="follow-up-note-hint"
          className="mt-1 block w-full rounded-md border border-slate-400 bg-white px-3 py-2 text-base focus-visible:outline-2 focus-visible:outline-offset-1 focus-visible:outline-sea-600"
        />
      </div>
      <FormMessage message={update.isError ? update.error.message : null} />
      <div className="flex justify-end gap-2">
        <Button variant="secondary" onClick={onClose} disabled={update.isPending}>
          Cancel
        </Button>
        <Button type="submit" busy={update.isPending}>
          Save
        </Button>
      </div>
    </form>
  );
}
