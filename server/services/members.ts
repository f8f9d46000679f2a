// Setup → People: an admin changes a member's roles or (de)activates them. Removing a role or
// deactivating ends the member's sessions in this program; the program keeps an active admin.
import type { Db } from "../db/knex";
import { notFound } from "../http/errors";
import type { Role } from "../../shared/roles";
import { activeAdminCount, deactivateMember, findMember, listMembers, reactivateMember, setMemberRoles, type MemberRow } from "../repositories/members";
import { endSessions } from "../repositories/sessions";
import { auditAs } from "../repositories/audit";
import { assertKeepsAnAdmin, assertNotSelf, losesARole } from "../policies/membership";
import type { Actor } from "./actor";

export const programMembers = (db: Db, programId: string) => listMembers(db, programId);

export function changeRoles(db: Db, actor: Actor, userId: string, roles: Role[]): Promise<MemberRow> {
  return db.transaction(async (trx) => {
    const target = await findMember(trx, actor.programId, userId, true);
    if (!target) throw notFound("Member");
    const wasAdmin = target.roles.includes("admin") && target.deactivated_at === null;
    assertKeepsAnAdmin(await activeAdminCount(trx, actor.programId, userId), wasAdmin, roles.includes("admin"));
    await setMemberRoles(trx, actor.programId, userId, roles);
    if (losesARole(target.roles, roles)) {
      await endSessions(trx, { userId, programId: actor.programId, reason: "roles_changed" });
    }
    await auditAs(trx, actor, { action: "member.roles_changed", entityType: "user", entityId: userId, details: { from: target.roles, to: roles } });
    return { ...target, roles };
  });
}

/** Deactivates (never oneself, never the last active admin) or reactivates a member. */
export function setMemberActive(db: Db, actor: Actor, userId: string, active: boolean): Promise<MemberRow> {
  return db.transaction(async (trx) => {
    const target = await findMember(trx, actor.programId, userId, true);
    if (!target) throw notFound("Member");
    let deactivatedAt: Date | null = null;
    if (!active) {
      assertNotSelf(actor, userId, "deactivate");
      assertKeepsAnAdmin(await activeAdminCount(trx, actor.programId, userId), target.roles.includes("admin") && !target.deactivated_at, false);
      await endSessions(trx, { userId, programId: actor.programId, reason: "deactivated" });
      deactivatedAt = target.deactivated_at ?? new Date();
      await deactivateMember(trx, actor.programId, userId, deactivatedAt);
    } else {
      await reactivateMember(trx, actor.programId, userId);
    }
    await auditAs(trx, actor, { action: active ? "member.reactivated" : "member.deactivated", entityType: "user", entityId: userId });
    return { ...target, deactivated_at: deactivatedAt };
  });
}
