// Invitations from the accept page: what one offers, and accepting it. Both are public and
// rate-limited; the token is checked before any password is hashed.
import { z } from "zod";
import type { RequestHandler } from "express";
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { HttpError, validationError } from "../../http/errors";
import { acceptInvitationNewSchema, acceptInvitationSchema, invitationPreviewSchema, loginResponseSchema } from "../../../shared/schemas/auth";
import { verifyPassword, hashPassword } from "../../auth/passwords";
import { hashToken } from "../../auth/tokens";
import { activeMemberships } from "../../repositories/members";
import { audit } from "../../repositories/audit";
import { openSession } from "../../services/sign-in";

export function registerInvitationRoutes(kit: RouteKit, { db, config }: RouteContext, limits: RequestHandler[]) {
  const openInvitation = (trx: typeof db, token: string) =>
    trx("invitations as i")
      .join("programs as p", "p.id", "i.program_id")
      .where("i.token_hash", hashToken(token))
      .whereNull("i.accepted_at")
      .whereNull("i.revoked_at")
      .andWhere("i.expires_at", ">", trx.fn.now());

  const invitationNotFound = () => new HttpError(404, "invitation_not_found", "This invitation is invalid, used, revoked or expired");

  defineRoute(kit, {
    method: "get",
    path: "/auth/invitations/:token",
    summary: "What an invitation offers, for the accept page",
    tag: "auth",
    access: "public",
    params: z.object({ token: z.string().min(20).max(200) }),
    before: limits,
    responses: {
      200: { description: "The invitation", schema: invitationPreviewSchema },
      404: { description: "Not valid" },
      429: { description: "Too many attempts" },
    },
    handler: async ({ params }) => {
      const inv = await openInvitation(db, params.token).first("i.email", "i.roles", "i.name", "p.name as program_name");
      if (!inv) throw invitationNotFound();
      const existing = await db("users").where("email", inv.email).whereNotNull("password_hash").first("id");
      return { email: inv.email, programName: inv.program_name, roles: inv.roles, existingUser: Boolean(existing), name: inv.name ?? null };
    },
  });

  defineRoute(kit, {
    method: "post",
    path: "/auth/invitations/accept",
    summary: "Accept an invitation: set a password (or confirm your existing one) and join the program",
    tag: "auth",
    access: "public",
    body: acceptInvitationSchema,
    before: limits,
    responses: {
      200: { description: "Joined and signed in", schema: loginResponseSchema },
      404: { description: "Not valid" },
      429: { description: "Too many attempts" },
    },
    handler: async ({ req, res, body }) => {
      // The token first: a bad one costs a lookup, never a hash.
      const open = await openInvitation(db, body.token).first("i.email");
      if (!open) throw invitationNotFound();
      const existingAccount = await db("users").where("email", open.email).whereNotNull("password_hash").first("id");
      if (!existingAccount) {
        // A new person: the stricter rules of a new account apply.
        const strict = acceptInvitationNewSchema.safeParse(body);
        if (!strict.success) throw validationError(strict.error, "body");
      }
      // An existing account confirms its password instead; only a new password is hashed.
      const passwordHash = existingAccount ? undefined : await hashPassword(body.password, config.bcryptRounds);
      return db.transaction(async (trx) => {
        const inv = await openInvitation(trx, body.token).forUpdate("i").first("i.*", "p.name as program_name");
        if (!inv) throw invitationNotFound();
        let user = await trx("users").where("email", inv.email).forUpdate().first("id", "name", "email", "password_hash");
        if (user?.password_hash) {
          // An existing account proves itself with its own password.
          if (!(await verifyPassword(body.password, user.password_hash, config.bcryptRounds))) {
            throw new HttpError(400, "wrong_password", "password: you already have an account; enter its current password to join");
          }
        } else {
          const newHash = passwordHash ?? (await hashPassword(body.password, config.bcryptRounds));
          if (user) {
            await trx("users").where("id", user.id).update({ name: body.name!, password_hash: newHash, password_changed_at: trx.fn.now() });
          } else {
            [user] = await trx("users")
              .insert({ email: inv.email, name: body.name!, password_hash: newHash, password_changed_at: trx.fn.now() })
              .returning(["id", "name", "email"]);
          }
        }
        await trx.raw(
          `INSERT INTO memberships (user_id, program_id, roles) VALUES (?, ?, ?)
           ON CONFLICT (user_id, program_id) DO UPDATE SET roles = EXCLUDED.roles, deactivated_at = NULL`,
          [user!.id, inv.program_id, inv.roles],
        );
        await trx("invitations").where("id", inv.id).update({ accepted_at: trx.fn.now() });
        await audit(trx, {
          programId: inv.program_id,
          actorUserId: user!.id,
          action: "invitation.accepted",
          entityType: "invitation",
          entityId: inv.id,
          ip: req.ip,
        });
        const me = (await activeMemberships(trx, user!.id)).find((m) => m.programId === inv.program_id)!;
        return openSession(trx, config, req, res, me, "auth.signed_in");
      });
    },
  });
}
