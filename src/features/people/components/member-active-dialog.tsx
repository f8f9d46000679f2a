// The confirm step before deactivating or reactivating a member. Deactivation signs the
// person out and stops their access; their exams and reviews stay.
import { useState } from "react";
import type { Member } from "../../../../shared/schemas/users";
import { errorMessage, isApiError } from "../../../lib/api-errors";
import { ConfirmDialog } from "../../../components/ui/dialog";
import { useSetActive } from "../api/people";

export function MemberActiveDialog({ member, onClose }: { member: Member | null; onClose: () => void }) {
  const setActive = useSetActive();
  const [error, setError] = useState<string | null>(null);
  const deactivating = member?.active ?? true;

  function close() {
    setError(null);
    setActive.reset();
    onClose();
  }

  async function confirm() {
    if (!member) return;
    setError(null);
    try {
      await setActive.mutateAsync({ id: member.id, active: !member.active });
      close();
    } catch (e) {
      if (isApiError(e) && e.code === "last_admin") setError("The program must keep at least one active administrator.");
      else setError(errorMessage(e, "The change did not go through."));
    }
  }

  return (
    <ConfirmDialog
      open={member !== null}
      title={deactivating ? `Deactivate ${member?.name ?? ""}?` : `Reactivate ${member?.name ?? ""}?`}
      confirmLabel={deactivating ? "Deactivate" : "Reactivate"}
      tone={deactivating ? "danger" : "primary"}
      busy={setActive.isPending}
      error={error}
      onConfirm={confirm}
      onClose={close}
    >
      {deactivating ? (
        <p>
          {member?.name} will be signed out and can no longer sign in to this program. Their exams, reviews and history stay. You can reactivate them later.
        </p>
      ) : (
        <p>{member?.name} will be able to sign in again with their existing roles.</p>
      )}
    </ConfirmDialog>
  );
}
