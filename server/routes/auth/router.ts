// Sign-in, sign-out, the current user, password reset and change, moving between programs;
// invitations from ./invitations.ts, rate limits from ./limits.ts.
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import {
  changePasswordSchema,
  forgotAnswerSchema,
  forgotPasswordSchema,
  loginResponseSchema,
  loginSchema,
  meResponseSchema,
  myProgramsSchema,
  programChoiceSchema,
  resetPasswordSchema,
} from "./schema";
import { clearSessionCookie } from "../../auth/cookies";
import { actorOf } from "../../services/actor";
import { myPrograms, signIn, switchProgram } from "../../services/sign-in";
import { signOut } from "../../services/sign-out";
import { changePassword, requestPasswordReset, resetPassword } from "../../services/passwords";
import { authLimiters } from "./limits";
import { registerInvitationRoutes } from "./invitations";

export function registerAuthRoutes(kit: RouteKit, ctx: RouteContext) {
  const { db, config, log } = ctx;
  // Sign-in counts failures only; once a limit is reached even a right password waits out
  // the window. See ./limits.ts.
  const limits = authLimiters(config.loginRateLimit);

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
    handler: ({ req, res, body }) => signIn(db, config, req, res, body),
  });

  defineRoute(kit, {
    method: "post",
    path: "/auth/logout",
    summary: "Sign out: revokes this session's token",
    tag: "auth",
    access: "signed_in",
    responses: { 204: { description: "Signed out" } },
    handler: async ({ req, res, user }) => {
      await signOut(db, actorOf(req, user), user.sessionId);
      clearSessionCookie(res, config);
    },
  });

  defineRoute(kit, {
    method: "get",
    path: "/auth/me",
    summary: "The signed-in user",
    tag: "auth",
    access: "signed_in",
    responses: { 200: { description: "The user", schema: meResponseSchema } },
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
    responses: {
      202: { description: "If the address belongs to a member, a link is on its way", schema: forgotAnswerSchema },
      429: { description: "Too many attempts" },
    },
    handler: ({ res, body }) => {
      // Answered before any lookup: the service starts its work once this answer is out.
      requestPasswordReset(db, config, log, body.email);
      res.status(202);
      return { ok: true as const };
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
      await resetPassword(db, config, req.ip ?? null, body);
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
      await changePassword(db, config, actorOf(req, user), user.sessionId, body);
    },
  });

  defineRoute(kit, {
    method: "get",
    path: "/auth/programs",
    summary: "The programs you belong to, and which one this session is in",
    tag: "auth",
    access: "signed_in",
    responses: { 200: { description: "Programs", schema: myProgramsSchema } },
    handler: ({ user }) => myPrograms(db, user),
  });

  defineRoute(kit, {
    method: "post",
    path: "/auth/switch-program",
    summary: "Move your session to another program you belong to (a new token; the old one ends)",
    tag: "auth",
    access: "signed_in",
    body: programChoiceSchema,
    responses: { 200: { description: "Signed in to that program", schema: loginResponseSchema }, 404: { description: "Not a member of that program" } },
    handler: ({ req, res, user, body }) => switchProgram(db, config, req, res, user, body.programId),
  });

  registerInvitationRoutes(kit, ctx, limits.byToken);
}
