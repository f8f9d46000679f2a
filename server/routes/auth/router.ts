// Sign-in, sign-out, the current user, password reset and change, invitation acceptance.
import { z } from "zod";
import { rateLimit, ipKeyGenerator } from "express-rate-limit";
import type { RequestHandler } from "express";
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../app";
import { HttpError, validationError } from "../../http/errors";
import {
  acceptInvitationNewSchema,
  acceptInvitationSchema,
  myProgramsSchema,
  programChoiceSchema,
  changePasswordSchema,
  forgotPasswordSchema,
  invitationPreviewSchema,
  loginResponseSchema,
  loginSchema,
  resetPasswordSchema,
  sessionUserSchema,
} from "../../../shared/schemas/auth";
import { verifyPassword, hashPassword } from "../../auth/passwords";
import { clearSessionCookie } from "../../auth/cookies";
import { hashToken, newEmailToken } from "../../auth/tokens";
import { activeMemberships } from "../../repositories/members";
import { revokeSessions } from "../../repositories/sessions";
import { audit } from "../../repositories/audit";
import { openSession } from "../../services/sign-in";
import { passwordResetMail } from "../../mail/templates";
import { queueMail } from "../../mail/outbox";

const RESET_MINUTES = 60;
const invalidCredentials = () => new HttpError(401, "invalid_credentials", "E-mail or password is incorrect");

function limiter(windowMs: number, limit: number, key: (req: Parameters<RequestHandler>[0]) => string): RequestHandler {
  return rateLimit({
    windowMs,
    limit,
    standardHeaders: "draft-8",
    legacyHeaders: false,
    keyGenerator: (req) => `${ipKeyGenerator(req.ip ?? "unknown")}|${key(req)}`,
    handler: (_req, _res, next) => next(new HttpError(429, "rate_limited", "Too many attempts; wait a few minutes and try again")),
  });
}

const bodyEmail = (req: { body?: { email?: unknown } }) => (typeof req.body?.email === "string" ? req.body.email.trim().toLowerCase() : "");

export function registerAuthRoutes(kit: RouteKit, { db, config }: RouteContext) {
  // Counted per address and client, failures only: a right password resets nothing, but
  // once the limit is reached even a right password waits out the window.
  const loginLimiter = limiter(config.loginRateLimit.windowMs, config.loginRateLimit.max, bodyEmail);
  const forgotLimiter = limiter(config.loginRateLimit.windowMs, config.loginRateLimit.max, bodyEmail);

  defineRoute(kit, {
    method: "post",
    path: "/auth/login",
    summary: "Sign in with e-mail and password",
    tag: "auth",
    access: "public",
    body: loginSchema,
    before: [loginLimiter],
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
    before: [forgotLimiter],
    responses: { 202: { description: "If the address belongs to a member, a link is on its way" } },
    handler: async ({ res, body }) => {
      const user = await db("users").where("email", body.email).first("id", "email");
      const memberships = user ? await activeMemberships(db, user.id) : [];
      if (user && memberships.length > 0) {
        const { token, hash } = newEmailToken();
        // Delivered by the outbox's sender, so the response time does not tell whether the address exists.
        const link = `${config.appUrl}/reset-password?token=${token}`;
        await db.transaction(async (trx) => {
          await trx("password_resets").insert({
            user_id: user.id,
            token_hash: hash,
            expires_at: trx.raw(`now() + make_interval(mins => ?)`, [RESET_MINUTES]),
          });
          await queueMail(trx, passwordResetMail({ to: user.email, link, expiresMinutes: RESET_MINUTES }));
        });
      }
      res.status(202).json({ ok: true });
    },
  });

  defineRoute(kit, {
    method: "post",
    path: "/auth/password/reset",
    summary: "Set a new password with the one-time token from the reset e-mail",
    tag: "auth",
    access: "public",
    body: resetPasswordSchema,
    responses: { 204: { description: "Password set; every session of the user is signed out" } },
    handler: async ({ req, body }) => {
      const passwordHash = await hashPassword(body.password, config.bcryptRounds);
      await db.transaction(async (trx) => {
        const reset = await trx("password_resets").where("token_hash", hashToken(body.token)).forUpdate().first();
        if (!reset || reset.used_at || reset.expires_at < new Date()) {
          throw new HttpError(400, "invalid_token", "token: this reset link is invalid, used or expired; ask for a new one");
        }
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
    responses: { 200: { description: "The invitation", schema: invitationPreviewSchema }, 404: { description: "Not valid" } },
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
    responses: { 200: { description: "Joined and signed in", schema: loginResponseSchema }, 404: { description: "Not valid" } },
    handler: async ({ req, res, body }) => {
      const existingAccount = await db("users")
        .where("email", db("invitations").where("token_hash", hashToken(body.token)).select("email").limit(1))
        .whereNotNull("password_hash")
        .first("id");
      if (!existingAccount) {
        // A new person: the stricter rules of a new account apply.
        const strict = acceptInvitationNewSchema.safeParse(body);
        if (!strict.success) throw validationError(strict.error, "body");
      }
      const passwordHash = await hashPassword(body.password, config.bcryptRounds);
      return db.transaction(async (trx) => {
        const inv = await openInvitation(trx, body.token).forUpdate("i").first("i.*", "p.name as program_name");
        if (!inv) throw invitationNotFound();
        let user = await trx("users").where("email", inv.email).forUpdate().first("id", "name", "email", "password_hash");
        if (user?.password_hash) {
          // An existing account proves itself with its own password.
          if (!(await verifyPassword(body.password, user.password_hash, config.bcryptRounds))) {
            throw new HttpError(400, "wrong_password", "password: you already have an account; enter its current password to join");
          }
        } else if (user) {
          await trx("users").where("id", user.id).update({ name: body.name!, password_hash: passwordHash, password_changed_at: trx.fn.now() });
        } else {
          [user] = await trx("users")
            .insert({ email: inv.email, name: body.name!, password_hash: passwordHash, password_changed_at: trx.fn.now() })
            .returning(["id", "name", "email"]);
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
