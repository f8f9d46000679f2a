// Invitations not yet accepted or revoked, with a confirm step before revoking one.
import { useState } from "react";
import { ROLE_LABELS } from "../../../../shared/roles";
import type { Invitation } from "../../../../shared/schemas/users";
import { formatDate } from "../../../lib/format";
import { Button } from "../../../components/ui/button";
import { ConfirmDialog } from "../../../components/ui/dialog";
import { StatusTag } from "../../../components/ui/status-tag";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { useInvitations, useRevokeInvitation } from "../api/people";
import { errorMessage } from "../../../lib/api-errors";

export function InvitationsList() {
  const query = useInvitations(true);
  const revoke = useRevokeInvitation();
  const [target, setTarget] = useState<Invitation | null>(null);
  const [error, setError] = useState<string | null>(null);
  // "Expired" is judged at the time the list was fetched, which keeps rendering pure.
  const now = query.dataUpdatedAt;

  const pending = (query.data?.invitations ?? []).filter((i) => !i.acceptedAt && !i.revokedAt);

  function close() {
    setTarget(null);
    setError(null);
  }

  async function confirm() {
    if (!target) return;
    try {
      await revoke.mutateAsync(target.id);
      close();
    } catch (e) {
      setError(errorMessage(e, "The invitation could not be revoked."));
    }
  }

  return (
    <section aria-labelledby="invitations-heading">
      <h2 id="invitations-heading" className="mb-3 text-lg font-semibold text-ink-950">
        Pending invitations
      </h2>
      {query.isPending ? (
        <LoadingState label="Loading invitations…" />
      ) : query.isError ? (
        <ErrorState error={query.error} onRetry={() => void query.refetch()} retrying={query.isFetching} />
      ) : pending.length === 0 ? (
        <EmptyState title="No pending invitations">Everyone invited has joined, or no one has been invited yet.</EmptyState>
      ) : (
        <ul className="divide-y divide-slate-100 rounded-lg border border-slate-200 bg-white">
          {pending.map((inv) => {
            const expired = new Date(inv.expiresAt).getTime() < now;
            return (
              <li key={inv.id} className="flex flex-wrap items-center justify-between gap-3 px-4 py-3">
                <div className="min-w-0">
                  <p className="break-all font-semibold text-ink-950">{inv.email}</p>
                  <p className="text-sm text-slate-600">
                    {inv.roles.map((r) => ROLE_LABELS[r]).join(", ")} · invited {formatDate(inv.createdAt)}
                    {inv.invitedBy ? ` by ${inv.invitedBy}` : ""}
                  </p>
                </div>
                <div className="flex items-center gap-3">
                  {expired ? (
                    <StatusTag tone="off">Expired {formatDate(inv.expiresAt)}</StatusTag>
                  ) : (
                    <StatusTag tone="waiting">Waiting · expires {formatDate(inv.expiresAt)}</StatusTag>
                  )}
                  <Button variant="ghost" size="sm" onClick={() => setTarget(inv)} aria-label={`Revoke the invitation for ${inv.email}`}>
                    Revoke
                  </Button>
                </div>
              </li>
            );
          })}
        </ul>
      )}
      <ConfirmDialog
        open={target !== null}
        title="Revoke this invitation?"
        confirmLabel="Revoke"
        tone="danger"
        busy={revoke.isPending}
        error={error}
        onConfirm={confirm}
        onClose={close}
      >
        <p>The link sent to {target?.email} will stop working. You can invite the same address again later.</p>
      </ConfirmDialog>
    </section>
  );
}
