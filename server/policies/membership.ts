// Who may change whom in a program. Route access (roles) is checked by the route table;
// these are the rules that depend on the target as well.
import { HttpError } from "../http/errors";
import type { AuthUser } from "../auth/types";
import type { Role } from "../../shared/roles";

/** A program must keep at least one active admin, or nobody can manage it any more. */
export function assertKeepsAnAdmin(otherActiveAdmins: number, targetIsAdmin: boolean, targetKeepsAdmin: boolean) {
  if (targetIsAdmin && !targetKeepsAdmin && otherActiveAdmins === 0) {
    throw new HttpError(409, "last_admin", "The program would have no active administrator left");
  }
}

/** An admin may not deactivate their own membership (ask another admin). */
export function assertNotSelf(actor: AuthUser, targetUserId: string, what: string) {
  if (actor.id === targetUserId) throw new HttpError(409, "self_change", `You cannot ${what} yourself; ask another administrator`);
}

/** True when `after` drops a role that `before` held (sessions must then be renewed). */
export const losesARole = (before: Role[], after: Role[]) => before.some((r) => !after.includes(r));
