// Sign-in, sign-out, the current user, password reset and change, invitation acceptance.
import { z } from "zod";
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { HttpError } from "../../http/errors";
import {
  myProgramsSchema,
  programChoiceSchema,
  changePasswordSchema,
  forgotPasswordSchema,
  loginResponseSchema,
  loginSchema,
  resetPasswordSchema,
  sessionUserSchema,
} from "../../../shared/schemas/auth";
import { verifyPassword, hashPassword, hashCost } from "../../auth/passwords";
import { clearSessionCookie } from "../../auth/cookies";
import { hashToken, newEmailToken } from "../../auth/tokens";
import { activeMemberships } from "../../repositories/members";
import { revokeSessions } from "../../repositories/sessions";
import { audit } from "../../repositories/audit";
import { openSession } from "../../services/sign-in";
import { passwordResetMail } from "../../mail/templates";
import { authLimiters } from "./limits";
import { registerInvitationRoutes } from "./invitations";
import { queueMail } from "../../mail/outbox";

const RESET_MINUTES = 60;
const invalidCredentials = () => new HttpError(401, "invalid_credentials", "E-mail or password is incorrect");

export function registerAuthRoutes(kit: RouteKit, ctx: RouteContext) {
  const { db, config, log } = ctx;
  // Sign-in counts failures only; once a limit is reached even a right password waits out
  // the window. See ./limits.ts.
  const limits = authLimiters(config.loginRateLimit);

  async function sendResetLink(email: string) {
    const user = await db("users").where("email", email).first("id", "email");
    const memberships = user ? await activeMemberships(db, user.id) : [];
    if (!user || memberships.length === 0) return;
    const { token, hash } = newEmailToken();
    const link = `${config.appUrl}/reset-password?token=${token}`;
    await db.transaction(async (trx) => {
      await trx("password_resets").insert({
        user_id: user.id,
        token_hash: hash,
        expires_at: trx.raw(`now() + make_interval(mins => ?)`, [RESET_MINUTES]),
      });
      // Delivered by the outbox's sender.
      await queueMail(trx, passwordResetMail({ to: user.email, link, expiresMinutes: RESET_MINUTES }));
    });
  }

  defineRoute(kit, {
    method: "post",
    path: "/auth/login",
    summary: "Sign in with e-mail and password",
    tag: "auth",
    access: "public",
    body: loginSchema,
    before: limits.login,
    responses: {
      200: { description: "Signed in; also sets the httpOnly session cookie", schema: loginResponseSchema },
      429: { description: "Too many attempts" },
    },
    handler: async ({ req, res, body }) => {
      const user = await db("users").where("email", body.email).first("id", "password_hash");
      const ok = await verifyPassword(body.password, user?.password_hash, config.bcryptRounds);
      const memberships = ok && user ? await activeMemberships(db, user.id) : [];
      const chosen = body.programId ? memberships.find((m) => m.programId === body.programId) : memberships[0];
      if (!ok || !chosen) {
        await audit(db, {
          programId: memberships[0]?.programId ?? null,
          actorUserId: user?.id ?? null,
          action: "auth.sign_in_failed",
          ip: req.ip,
          details: { email: body.email },
        });
        throw invalidCredentials();
      }
      // Hashes made at another cost (an older setting, the demo seed) are renewed at the
      // configured one, so every account costs the same to check as the unknown-address path.
      if (hashCost(user!.password_hash) !== config.bcryptRounds) {
        const renewed = await hashPassword(body.password, config.bcryptRounds);
        await db("users").where({ id: user!.id, password_hash: user!.password_hash }).update({ password_hash: renewed });
      }
      return db.transaction((trx) => openSession(trx, config, req, res, chosen, "auth.signed_in"));
    },
  });

  defineRoute(kit, {
    method: "post",
    path: "/auth/logout",
    summary: "Sign out: revokes this session's token",
    tag: "auth",
    access: "signed_in",
    responses: { 204: { description: "Signed out" } },
    handler: async ({ req, res, user }) => {
      await db.transaction(async (trx) => {
        await trx("sessions").where("id", user.sessionId).update({ revoked_at: trx.fn.now(), revoked_reason: "logout" });
        await audit(trx, {
          programId: user.programId,
          actorUserId: user.id,
          action: "auth.signed_out",
          entityType: "user",
          entityId: user.id,
          ip: req.ip,
        });
      });
      clearSessionCookie(res, config);
    },
  });

  defineRoute(kit, {
    method: "get",
    path: "/auth/me",
    summary: "The signed-in user",
    tag: "auth",
    access: "signed_in",
    responses: { 200: { description: "The user", schema: z.object({ user: sessionUserSchema }) } },
    handler: ({ user }) => ({
      user: { id: user.id, name: user.name, email: user.email, programId: user.programId, programName: user.programName, roles: user.roles },
    }),
  });

  defineRoute(kit, {
    method: "post",
    path: "/auth/password/forgot",
    summary: "Ask for a password-reset e-mail (always 202, whether or not the address exists)",
    tag: "auth",
    access: "public",
    body: forgotPasswordSchema,
    before: limits.forgot,
    responses: { 202: { description: "If the address belongs to a member, a link is on its way" }, 429: { description: "Too many attempts" } },
    handler: ({ res, body }) => {
      // Answered before any lookup: a real and an unknown address take the same path until
      // the response is out, so its timing tells nothing. The work goes on in the background.
      res.status(202).json({ ok: true });
      void sendResetLink(body.email).catch((err) => log({ msg: "password reset request failed", err }));
    },
  });

  defineRoute(kit, {
    method: "post",
    path: "/auth/password/reset",
    summary: "Set a new password with the one-time token from the reset e-mail",
    tag: "auth",
    access: "public",
    body: resetPasswordSchema,
    before: limits.byToken,
    responses: { 204: { description: "Password set; every session of the user is signed out" }, 429: { description: "Too many attempts" } },
    handler: async ({ req, body }) => {
      const tokenHash = hashToken(body.token);
      const usable = (r: { used_at: Date | null; expires_at: Date } | undefined) => Boolean(r && !r.used_at && r.expires_at > new Date());
      const invalid = () => new HttpError(400, "invalid_token", "token: this reset link is invalid, used or expired; ask for a new one");
      // The token first: a bad one costs a lookup, never a hash.
      if (!usable(await db("password_resets").where("token_hash", tokenHash).first("used_at", "expires_at"))) throw invalid();
      const passwordHash = await hashPassword(body.password, config.bcryptRounds);
      await db.transaction(async (trx) => {
        // Checked again under the row lock: two requests with one link set one password.
        const reset = await trx("password_resets").where("token_hash", tokenHash).forUpdate().first();
        if (!usable(reset)) throw invalid();
        await trx("users").where("id", reset.user_id).update({ password_hash: passwordHash, password_changed_at: trx.fn.now() });
        // Every outstanding link of this user dies with the one just used.
        await trx("password_resets").where("user_id", reset.user_id).whereNull("used_at").update({ used_at: trx.fn.now() });
        await revokeSessions(trx, { userId: reset.user_id, reason: "password_reset" });
        await trx.raw(
          `INSERT INTO audit_log (program_id, actor_user_id, action, entity_type, entity_id, ip)
           SELECT program_id, ?, 'auth.password_reset', 'user', ?, ? FROM memberships WHERE user_id = ?`,
          [reset.user_id, reset.user_id, req.ip ?? null, reset.user_id],
        );
      });
    },
  });

  defineRoute(kit, {
    method: "post",
    path: "/auth/password/change",
    summary: "Change your password; your other sessions are signed out",
    tag: "auth",
    access: "signed_in",
    body: changePasswordSchema,
    responses: { 204: { description: "Changed" } },
    handler: async ({ req, user, body }) => {
      const row = await db("users").where("id", user.id).first("password_hash");
      if (!(await verifyPassword(body.currentPassword, row?.password_hash, config.bcryptRounds))) {
        throw new HttpError(400, "wrong_password", "currentPassword: the current password is not correct");
      }
      const passwordHash = await hashPassword(body.newPassword, config.bcryptRounds);
      await db.transaction(async (trx) => {
        await trx("users").where("id", user.id).update({ password_hash: passwordHash, password_changed_at: trx.fn.now() });
        await revokeSessions(trx, { userId: user.id, exceptSessionId: user.sessionId, reason: "password_changed" });
        await audit(trx, {
          programId: user.programId,
          actorUserId: user.id,
          action: "auth.password_changed",
          entityType: "user",
          entityId: user.id,
          ip: req.ip,
        });
      });
    },
  });

  defineRoute(kit, {
    method: "get",
    path: "/auth/programs",
    summary: "The programs you belong to, and which one this session is in",
    tag: "auth",
    access: "signed_in",
    responses: { 200: { description: "Programs", schema: myProgramsSchema } },
    handler: async ({ user }) => ({
      programs: (await activeMemberships(db, user.id)).map((m) => ({
        id: m.programId,
        name: m.programName,
        roles: m.roles,
        current: m.programId === user.programId,
      })),
    }),
  });

  defineRoute(kit, {
    method: "post",
    path: "/auth/switch-program",
    summary: "Move your session to another program you belong to (a new token; the old one ends)",
    tag: "auth",
    access: "signed_in",
    body: programChoiceSchema,
    responses: { 200: { description: "Signed in to that program", schema: loginResponseSchema }, 404: { description: "Not a member of that program" } },
    handler: async ({ req, res, user, body }) => {
      const target = (await activeMemberships(db, user.id)).find((m) => m.programId === body.programId);
      if (!target) throw new HttpError(404, "not_found", "programId: you are not an active member of that program");
      return db.transaction(async (trx) => {
        await trx("sessions").where("id", user.sessionId).update({ revoked_at: trx.fn.now(), revoked_reason: "switched_program" });
        return openSession(trx, config, req, res, target, "auth.switched_program");
      });
    },
  });

  registerInvitationRoutes(kit, ctx, limits.byToken);
}
