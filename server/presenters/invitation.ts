// One invitation as Setup → People shows it.
import type { Invitation } from "../../shared/schemas/users";
import type { InvitationRow } from "../repositories/invitations";

export const presentInvitation = (r: InvitationRow): Invitation => ({
  id: r.id,
  email: r.email,
  roles: r.roles,
  invitedBy: r.inviter_name,
  createdAt: r.created_at.toISOString(),
  expiresAt: r.expires_at.toISOString(),
  acceptedAt: r.accepted_at?.toISOString() ?? null,
  revokedAt: r.revoked_at?.toISOString() ?? null,
});
