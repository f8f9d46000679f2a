// Setup → People: members, invitations, roles, deactivation. Every query is scoped to the
// caller's program; another program's user answers 404.
import { z } from "zod";
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { HttpError, notFound } from "../../http/errors";
import { idParamsSchema } from "../../../shared/schemas/common";
import { invitationSchema, inviteSchema, memberSchema, updateRolesSchema } from "../../../shared/schemas/users";
import { activeAdminCount, findMember, listMembers, presentMember } from "../../repositories/members";
import { revokeSessions } from "../../repositories/sessions";
import { audit } from "../../repositories/audit";
import { newEmailToken } from "../../auth/tokens";
import { invitationMail } from "../../mail/templates";
import { queueMail } from "../../mail/outbox";
import { assertKeepsAnAdmin, assertNotSelf, losesARole } from "../../policies/membership";
import type { Role } from "../../../shared/roles";

const INVITATION_HOURS = 72;

const presentInvitation = (r: {
  id: string;
  email: string;
  roles: Role[];
  inviter_name: string | null;
  created_at: Date;
  expires_at: Date;
  accepted_at: Date | null;
  revoked_at: Date | null;
}) => ({
  id: r.id,
  email: r.email,
  roles: r.roles,
  invitedBy: r.inviter_name,
  createdAt: r.created_at.toISOString(),
  expiresAt: r.expires_at.toISOString(),
  acceptedAt: r.accepted_at?.toISOString() ?? null,
  revokedAt: r.revoked_at?.toISOString() ?? null,
});

export function registerUserRoutes(kit: RouteKit, { db, config }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/users",
    summary: "Members of the program",
    tag: "people",
    access: ["admin", "qa_lead"],
    responses: { 200: { description: "Members", schema: z.object({ members: z.array(memberSchema) }) } },
    handler: async ({ user }) => ({ members: await listMembers(db, user.programId) }),
  });

  const invitations = (programId: string) =>
    db("invitations as i").leftJoin("users as u", "u.id", "i.invited_by").where("i.program_id", programId).select("i.*", "u.name as inviter_name");

  defineRoute(kit, {
    method: "get",
    path: "/users/invitations",
    summary: "Invitations of the program, newest first",
    tag: "people",
    access: ["admin"],
    responses: { 200: { description: "Invitations", schema: z.object({ invitations: z.array(invitationSchema) }) } },
    handler: async ({ user }) => ({ invitations: (await invitations(user.programId).orderBy("i.created_at", "desc").limit(200)).map(presentInvitation) }),
  });

  defineRoute(kit, {
    method: "post",
    path: "/users/invitations",
    summary: "Invite someone by e-mail; a one-time link lets them set a password and join",
    tag: "people",
    access: ["admin"],
    body: inviteSchema,
    responses: { 201: { description: "Invited", schema: z.object({ invitation: invitationSchema }) }, 409: { description: "Already a member" } },
    handler: async ({ req, res, user, body }) => {
      const existing = await db("memberships as m")
        .join("users as u", "u.id", "m.user_id")
        .where({ "u.email": body.email, "m.program_id": user.programId })
        .first("m.deactivated_at");
      if (existing && existing.deactivated_at === null) {
        throw new HttpError(409, "already_member", `email: ${body.email} is already a member of this program`);
      }
      const { token, hash } = newEmailToken();
      // The e-mail goes out inside the transaction: if it cannot be sent, no invitation is left behind.
      const invitation = await db.transaction(async (trx) => {
        await trx("invitations")
          .where({ program_id: user.programId, email: body.email })
          .whereNull("accepted_at")
          .whereNull("revoked_at")
          .update({ revoked_at: trx.fn.now() });
        const [row] = await trx("invitations")
          .insert({
            program_id: user.programId,
            email: body.email,
            name: body.name ?? null,
            roles: body.roles,
            token_hash: hash,
            invited_by: user.id,
            expires_at: trx.raw(`now() + make_interval(hours => ?)`, [INVITATION_HOURS]),
          })
          .returning("*");
        await audit(trx, {
          programId: user.programId,
          actorUserId: user.id,
          action: "invitation.created",
          entityType: "invitation",
          entityId: row.id,
          ip: req.ip,
          details: { email: body.email, roles: body.roles },
        });
        await queueMail(
          trx,
          invitationMail({
            to: body.email,
            programName: user.programName,
            roles: body.roles,
            inviter: user.name,
            link: `${config.appUrl}/invitation?token=${token}`,
            expiresHours: INVITATION_HOURS,
          }),
          user.programId,
        );
        return { ...row, inviter_name: user.name };
      });
      res.status(201).json({ invitation: presentInvitation(invitation) });
    },
  });

  defineRoute(kit, {
    method: "delete",
    path: "/users/invitations/:id",
    summary: "Revoke an open invitation",
    tag: "people",
    access: ["admin"],
    params: idParamsSchema,
    responses: { 204: { description: "Revoked" }, 404: { description: "No open invitation with this id in the program" } },
    handler: async ({ req, user, params }) => {
      await db.transaction(async (trx) => {
        const n = await trx("invitations")
          .where({ id: params.id, program_id: user.programId })
          .whereNull("accepted_at")
          .whereNull("revoked_at")
          .update({ revoked_at: trx.fn.now() });
        if (n === 0) throw notFound("Invitation");
        await audit(trx, {
          programId: user.programId,
          actorUserId: user.id,
          action: "invitation.revoked",
          entityType: "invitation",
          entityId: params.id,
          ip: req.ip,
        });
      });
    },
  });

  defineRoute(kit, {
    method: "put",
    path: "/users/:id/roles",
    summary: "Set a member's roles; removing a role signs them out everywhere in this program",
    tag: "people",
    access: ["admin"],
    params: idParamsSchema,
    body: updateRolesSchema,
    responses: {
      200: { description: "Updated", schema: z.object({ member: memberSchema }) },
      404: { description: "Not a member" },
      409: { description: "Would leave no admin" },
    },
    handler: async ({ req, user, params, body }) =>
      db.transaction(async (trx) => {
        const target = await findMember(trx, user.programId, params.id, true);
        if (!target) throw notFound("Member");
        const wasAdmin = target.roles.includes("admin") && target.deactivated_at === null;
        assertKeepsAnAdmin(await activeAdminCount(trx, user.programId, params.id), wasAdmin, body.roles.includes("admin"));
        await trx("memberships").where({ user_id: params.id, program_id: user.programId }).update({ roles: body.roles });
        if (losesARole(target.roles, body.roles)) {
          await revokeSessions(trx, { userId: params.id, programId: user.programId, reason: "roles_changed" });
        }
        await audit(trx, {
          programId: user.programId,
          actorUserId: user.id,
          action: "member.roles_changed",
          entityType: "user",
          entityId: params.id,
          ip: req.ip,
          details: { from: target.roles, to: body.roles },
        });
        return { member: presentMember({ ...target, roles: body.roles }) };
      }),
  });

  for (const action of ["deactivate", "reactivate"] as const) {
    defineRoute(kit, {
      method: "post",
      path: `/users/:id/${action}`,
      summary: action === "deactivate" ? "Deactivate a member: they can no longer sign in to this program" : "Reactivate a deactivated member",
      tag: "people",
      access: ["admin"],
      params: idParamsSchema,
      responses: {
        200: { description: "Done", schema: z.object({ member: memberSchema }) },
        404: { description: "Not a member" },
        409: { description: "Not allowed for this member" },
      },
      handler: async ({ req, user, params }) =>
        db.transaction(async (trx) => {
          const target = await findMember(trx, user.programId, params.id, true);
          if (!target) throw notFound("Member");
          if (action === "deactivate") {
            assertNotSelf(user, params.id, "deactivate");
            assertKeepsAnAdmin(await activeAdminCount(trx, user.programId, params.id), target.roles.includes("admin") && !target.deactivated_at, false);
            await revokeSessions(trx, { userId: params.id, programId: user.programId, reason: "deactivated" });
          }
          const deactivatedAt = action === "deactivate" ? (target.deactivated_at ?? new Date()) : null;
          await trx("memberships").where({ user_id: params.id, program_id: user.programId }).update({ deactivated_at: deactivatedAt });
          await audit(trx, {
            programId: user.programId,
            actorUserId: user.id,
            action: `member.${action}d`,
            entityType: "user",
            entityId: params.id,
            ip: req.ip,
          });
          return { member: presentMember({ ...target, deactivated_at: deactivatedAt }) };
        }),
    });
  }
}
