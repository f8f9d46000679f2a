// Setup → People: an admin changes a member's roles or (de)activates them. Removing a role or
// deactivating ends the member's sessions in this program; the program keeps an active admin.
import type { Db } from "../db/knex";
import { notFound } from "../http/errors";
import type { Role } from "../../shared/roles";
import {
  activeAdminCount,
  deactivateMember,
  findMember,
  listMembers,
  operatorNameHolders,
  reactivateMember,
  setMemberRoles,
  setOperatorNames,
  type MemberRow,
} from "../repositories/members";
import { HttpError } from "../http/errors";
import { normaliseOperatorName } from "../../shared/schemas/users";
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

/**
 * Sets the DICOM operator names a member's scans carry (QA lead or admin). A name another
 * member already gave is refused (409 naming it): a received study is matched only to one person.
 */
export function changeOperatorNames(db: Db, actor: Actor, userId: string, names: string[]): Promise<MemberRow> {
  return db.transaction(async (trx) => {
    const target = await findMember(trx, actor.programId, userId, true);
    if (!target) throw notFound("Member");
    const holders = await operatorNameHolders(trx, actor.programId, userId);
    for (const [i, name] of names.entries()) {
      const holder = holders.find((h) => h.dicom_operator_names.some((n) => normaliseOperatorName(n) === normaliseOperatorName(name)));
      if (holder)
        throw new HttpError(409, "operator_name_taken", `names.${i}: "${name}" is already an operator name of ${holder.name}`, [
          { path: `names.${i}`, message: `Already an operator name of ${holder.name}` },
        ]);
    }
    await setOperatorNames(trx, actor.programId, userId, names);
    await auditAs(trx, actor, {
      action: "member.operator_names_changed",
      entityType: "user",
      entityId: userId,
      details: { from: target.dicom_operator_names, to: names },
    });
    return { ...target, dicom_operator_names: names };
  });
}
