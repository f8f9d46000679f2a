// Moving a follow-up on: its status, and to close it the outcome (what was done for the
// patient), when it was done and who did it, and a note (required for some outcomes). The
// same shared schema as the server checks it first, so each problem is named by its field.
import { useState } from "react";
import { FOLLOW_UP_OUTCOMES, OUTCOME_LABELS, OUTCOMES_NEEDING_NOTE, followUpUpdateSchema, type FollowUpOutcome } from "../../../../shared/schemas/follow-ups";
import { Button } from "../../../components/ui/button";
import { Dialog } from "../../../components/ui/dialog";
import { FormMessage } from "../../../components/ui/form-message";
import { SelectField } from "../../../components/ui/select-field";
import { TextField } from "../../../components/ui/text-field";
import { errorMessage, isApiError, validationIssues } from "../../../lib/api-errors";
import { isoToLocalInput, localInputToIso, nowToTheMinute } from "../../../lib/datetime-local";
import { formatDateTime } from "../../../lib/format";
import { FOLLOW_UP_WORDS, useRevealEncounterRef, useUpdateFollowUp, type FollowUp, type FollowUpStatus } from "../api/oversight";

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
  const [outcome, setOutcome] = useState<FollowUpOutcome | "">(followUp.outcome ?? "");
  const [actedAt, setActedAt] = useState(followUp.actedAt ? isoToLocalInput(followUp.actedAt) : nowToTheMinute());
  const [actedBy, setActedBy] = useState(followUp.actedBy ?? "");
  const [issues, setIssues] = useState<Record<string, string>>({});
  const closing = status === "closed";

  const onSubmit = (e: React.FormEvent) => {
    e.preventDefault();
    const body = {
      status,
      note,
      outcome: outcome || null,
      actedAt: closing && actedAt ? localInputToIso(actedAt) : null,
      actedBy: actedBy.trim(),
    };
    const parsed = followUpUpdateSchema.safeParse(body);
    if (!parsed.success) {
      setIssues(Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0] ?? "form"), i.message])));
      return;
    }
    setIssues({});
    update.mutate(
      { id: followUp.id, ...body },
      {
        onSuccess: onClose,
        onError: (error) => {
          if (isApiError(error, 400)) setIssues(Object.fromEntries(validationIssues(error.details, error.message).map((i) => [i.path, i.message])));
        },
      },
    );
  };

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <p className="whitespace-pre-line text-sm text-slate-700">{followUp.reason}</p>
      <p className="text-sm text-slate-700">
        Due {formatDateTime(followUp.dueAt)}
        {followUp.overdue ? <span className="font-semibold text-coral-700"> — overdue</span> : null}
      </p>
      {followUp.hasEncounterRef ? <EncounterRef followUpId={followUp.id} /> : null}
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
      {closing ? (
        <>
          <SelectField
            label="Outcome"
            value={outcome}
            onChange={(e) => setOutcome(e.target.value as FollowUpOutcome | "")}
            error={issues.outcome}
            hint="What was done for the patient. Needed to close."
          >
            <option value="">Choose…</option>
            {FOLLOW_UP_OUTCOMES.map((o) => (
              <option key={o} value={o}>
                {OUTCOME_LABELS[o]}
              </option>
            ))}
          </SelectField>
          <div className="grid gap-3 sm:grid-cols-2">
            <TextField label="Acted on" type="datetime-local" value={actedAt} onChange={(e) => setActedAt(e.target.value)} error={issues.actedAt} />
            <TextField
              label="Who acted"
              hint="If not you"
              value={actedBy}
              maxLength={120}
              onChange={(e) => setActedBy(e.target.value)}
              error={issues.actedBy}
            />
          </div>
        </>
      ) : null}
      <div>
        <label htmlFor="follow-up-note" className="block text-sm font-semibold text-ink-900">
          Note{outcome && OUTCOMES_NEEDING_NOTE.includes(outcome) && closing ? " (required)" : ""}
        </label>
        <p id="follow-up-note-hint" className="text-sm text-slate-600">
          What was done and by whom, in plain words. No patient names or record numbers.
        </p>
        <textarea
          id="follow-up-note"
          rows={3}
          maxLength={2000}
          value={note}
          onChange={(e) => setNote(e.target.value)}
          aria-invalid={issues.note ? true : undefined}
          aria-describedby={`follow-up-note-hint${issues.note ? " follow-up-note-error" : ""}`}
          className="mt-1 block w-full rounded-md border border-slate-400 bg-white px-3 py-2 text-base focus-visible:outline-2 focus-visible:outline-offset-1 focus-visible:outline-sea-600"
        />
        {issues.note ? (
          <p id="follow-up-note-error" className="mt-1 text-sm text-coral-700">
            {issues.note}
          </p>
        ) : null}
      </div>
      <FormMessage message={issues.form ?? (update.isError && !isApiError(update.error, 400) ? errorMessage(update.error, "Saving did not work.") : null)} />
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

/** The clinician's encounter reference, opened only on request; each opening is audited. */
function EncounterRef({ followUpId }: { followUpId: string }) {
  const reveal = useRevealEncounterRef();
  return (
    <div className="rounded-md border border-slate-200 bg-paper-200 px-3 py-2 text-sm">
      {reveal.data ? (
        <p>
          Encounter reference: <output className="font-mono font-semibold text-ink-950">{reveal.data}</output>
        </p>
      ) : (
        <div className="flex flex-wrap items-center gap-2">
          <Button size="sm" variant="secondary" busy={reveal.isPending} onClick={() => reveal.mutate(followUpId)}>
            Show encounter reference
          </Button>
          <span className="text-slate-600">For the callback. Opening it is recorded in the audit log.</span>
        </div>
      )}
      <FormMessage message={reveal.isError ? errorMessage(reveal.error, "The reference could not be opened.") : null} />
    </div>
  );
}
