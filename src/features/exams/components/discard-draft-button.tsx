// Discarding a draft removes it and its clips for good, so it asks first.
import { useState } from "react";
import { useNavigate } from "react-router-dom";
import type { Exam } from "../../../../shared/schemas/exams";
import { Button } from "../../../components/ui/button";
import { ConfirmDialog } from "../../../components/ui/dialog";
import { useDeleteExam } from "../api/exams";

export function DiscardDraftButton({ exam }: { exam: Exam }) {
  const [open, setOpen] = useState(false);
  const discard = useDeleteExam();
  const navigate = useNavigate();
  return (
    <>
      <Button variant="ghost" onClick={() => setOpen(true)}>
        Discard draft
      </Button>
      <ConfirmDialog
        open={open}
        title={`Discard draft ${exam.code}?`}
        confirmLabel="Discard draft"
        tone="danger"
        busy={discard.isPending}
        error={discard.isError ? discard.error.message : null}
        onClose={() => setOpen(false)}
        onConfirm={() =>
          // Awaited, not an onSuccess option: the removed exam may unmount this button first.
          void discard
            .mutateAsync(exam.id)
            .then(() => navigate("/exams", { replace: true, state: { notice: `Draft ${exam.code} was discarded.` } }))
            .catch(() => undefined)
        }
      >
        The details and its {exam.clips.length === 1 ? "clip" : `${exam.clips.length} clips`} are removed. This cannot be undone.
      </ConfirmDialog>
    </>
  );
}
