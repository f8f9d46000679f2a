// The operator names a clinician's ultrasound machine writes into DICOM, one per line, so that
// studies the machine sends reach that clinician's received studies. A name can belong to one
// member only; the server says whose it is when it is taken.
import { useId, useState } from "react";
import { operatorNamesSchema, type Member } from "../../../../shared/schemas/users";
import { errorMessage, isApiError } from "../../../lib/api-errors";
import { Button } from "../../../components/ui/button";
import { Dialog } from "../../../components/ui/dialog";
import { FormMessage } from "../../../components/ui/form-message";
import { FieldError } from "../../../components/ui/text-field";
import { useUpdateOperatorNames } from "../api/people";

export function OperatorNamesDialog({ member, onClose }: { member: Member | null; onClose: () => void }) {
  return (
    <Dialog open={member !== null} title={member ? `DICOM operator names of ${member.name}` : "DICOM operator names"} onClose={onClose}>
      {member ? <OperatorNamesForm key={member.id} member={member} onDone={onClose} /> : null}
    </Dialog>
  );
}

function OperatorNamesForm({ member, onDone }: { member: Member; onDone: () => void }) {
  const update = useUpdateOperatorNames();
  const id = useId();
  const [text, setText] = useState(member.dicomOperatorNames.join("\n"));
  const [error, setError] = useState<string | null>(null);
  const [formError, setFormError] = useState<string | null>(null);

  const onSubmit = async (e: React.FormEvent) => {
    e.preventDefault();
    setError(null);
    setFormError(null);
    const parsed = operatorNamesSchema.safeParse({ names: text.split("\n").filter((l) => l.trim() !== "") });
    if (!parsed.success) {
      setError(parsed.error.issues[0]?.message ?? "Check the names");
      return;
    }
    try {
      await update.mutateAsync({ id: member.id, names: parsed.data.names });
      onDone();
    } catch (err) {
      if (isApiError(err, 409)) setError(err.message.replace(/^names\.\d+: /, ""));
      else setFormError(errorMessage(err, "The names could not be saved."));
    }
  };

  return (
    <form onSubmit={(e) => void onSubmit(e)} noValidate className="space-y-4">
      <div>
        <label htmlFor={id} className="block text-sm font-semibold text-ink-900">
          Operator names, one per line
        </label>
        <p id={`${id}-hint`} className="mt-0.5 text-sm text-slate-600">
          As the machine writes them, for example <span className="font-mono">Family^Given</span>. Case and the ^ separator do not matter; the order of the
          names does.
        </p>
        <textarea
          id={id}
          rows={4}
          value={text}
          onChange={(e) => setText(e.target.value)}
          aria-invalid={error ? true : undefined}
          aria-describedby={`${id}-hint${error ? ` ${id}-error` : ""}`}
          className={
            "mt-1 block w-full rounded-md border bg-white px-3 py-2 font-mono text-sm text-ink-950 focus-visible:outline-2 focus-visible:outline-offset-1 focus-visible:outline-sea-600 " +
            (error ? "border-coral-600" : "border-slate-400")
          }
        />
        <FieldError id={`${id}-error`} message={error ?? undefined} />
      </div>
      <FormMessage message={formError} />
      <div className="flex justify-end gap-2">
        <Button variant="secondary" onClick={onDone} disabled={update.isPending}>
          Cancel
        </Button>
        <Button type="submit" busy={update.isPending}>
          Save names
        </Button>
      </div>
    </form>
  );
}
