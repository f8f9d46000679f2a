// Who may change whom in a program. Route access (roles: admins manage people) is checked by
// the route table; these are the rules that depend on the target as well.
import { HttpError } from "../http/errors";
import type { Role } from "../../shared/roles";

/** A program must keep at least one active admin, or nobody can manage it any more. */
export function assertKeepsAnAdmin(otherActiveAdmins: number, targetIsAdmin: boolean, targetKeepsAdmin: boolean) {
  if (targetIsAdmin && !targetKeepsAdmin && otherActiveAdmins === 0) {
    throw new HttpError(409, "last_admin", "The program would have no active administrator left");
  }
}

/** An admin may not deactivate their own membership (ask another admin). */
export function assertNotSelf(actor: { userId: string }, targetUserId: string, what: string) {
  if (actor.userId === targetUserId) throw new HttpError(409, "self_change", `You cannot ${what} yourself; ask another administrator`);
}

/** An active member is not invited again; a deactivated one may be (accepting reactivates them). */
export function assertNotActiveMember(membership: { deactivated_at: Date | null } | undefined, email: string) {
  if (membership && membership.deactivated_at === null) {
    throw new HttpError(409, "already_member", `email: ${email} is already a member of this program`);
  }
}

/** True when `after` drops a role that `before` held (sessions must then be renewed). */
export const losesARole = (before: Role[], after: Role[]) => before.some((r) => !after.includes(r));
