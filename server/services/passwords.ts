// Passwords: asking for a reset link, setting a new password with it, and changing your own.
// Each new password ends the user's other sessions.
import type { Config } from "../config";
import type { Db } from "../db/knex";
import { HttpError } from "../http/errors";
import { hashPassword, verifyPassword } from "../auth/passwords";
import { hashToken, newEmailToken } from "../auth/tokens";
import { passwordResetMail } from "../mail/templates";
import { queueMail } from "../mail/outbox";
import { findAccountByEmail, passwordHashOf, setPassword } from "../repositories/users";
import { activeMemberships } from "../repositories/members";
import { createPasswordReset, findPasswordReset, usePasswordResets, type PasswordReset } from "../repositories/password-resets";
import { endSessions } from "../repositories/sessions";
import { auditAs, auditInEveryProgram } from "../repositories/audit";
import type { Actor } from "./actor";

const RESET_MINUTES = 60;

async function sendResetLink(db: Db, config: Config, email: string) {
  const user = await findAccountByEmail(db, email);
  const memberships = user ? await activeMemberships(db, user.id) : [];
  if (!user || memberships.length === 0) return;
  const { token, hash } = newEmailToken();
  const link = `${config.appUrl}/reset-password?token=${token}`;
  await db.transaction(async (trx) => {
    await createPasswordReset(trx, { userId: user.id, tokenHash: hash, minutes: RESET_MINUTES });
    // Delivered by the outbox's sender.
    await queueMail(trx, passwordResetMail({ to: user.email, link, expiresMinutes: RESET_MINUTES }));
  });
}

/**
 * Starts sending a reset link to `email` if it belongs to a member, after the current answer
 * has gone out: a real and an unknown address take the same path until then, so the answer's
 * timing tells nothing. Failures are logged, never answered.
 */
export function requestPasswordReset(db: Db, config: Config, log: (msg: unknown) => void, email: string): void {
  setImmediate(() => void sendResetLink(db, config, email).catch((err) => log({ msg: "password reset request failed", err })));
}

const usable = (r: PasswordReset | undefined): r is PasswordReset => Boolean(r && !r.used_at && r.expires_at > new Date());
const invalidToken = () => new HttpError(400, "invalid_token", "token: this reset link is invalid, used or expired; ask for a new one");

/** Sets a new password with a one-time link; every open link and every session of the user end. */
export async function resetPassword(db: Db, config: Config, ip: string | null, input: { token: string; password: string }): Promise<void> {
  const tokenHash = hashToken(input.token);
  // The token first: a bad one costs a lookup, never a hash.
  if (!usable(await findPasswordReset(db, tokenHash))) throw invalidToken();
  const passwordHash = await hashPassword(input.password, config.bcryptRounds);
  await db.transaction(async (trx) => {
    // Checked again under the row lock: two requests with one link set one password.
    const reset = await findPasswordReset(trx, tokenHash, { lock: true });
    if (!usable(reset)) throw invalidToken();
    await setPassword(trx, reset.user_id, passwordHash);
    // Every outstanding link of this user dies with the one just used.
    await usePasswordResets(trx, reset.user_id);
    await endSessions(trx, { userId: reset.user_id, reason: "password_reset" });
    await auditInEveryProgram(trx, reset.user_id, "auth.password_reset", ip);
  });
}

/** Changes the caller's password after checking the current one; their other sessions end. */
export async function changePassword(
  db: Db,
  config: Config,
  actor: Actor,
  sessionId: string,
  input: { currentPassword: string; newPassword: string },
): Promise<void> {
  if (!(await verifyPassword(input.currentPassword, await passwordHashOf(db, actor.userId), config.bcryptRounds))) {
    throw new HttpError(400, "wrong_password", "currentPassword: the current password is not correct");
  }
  const passwordHash = await hashPassword(input.newPassword, config.bcryptRounds);
  await db.transaction(async (trx) => {
    await setPassword(trx, actor.userId, passwordHash);
    await endSessions(trx, { userId: actor.userId, exceptSessionId: sessionId, reason: "password_changed" });
    await auditAs(trx, actor, { action: "auth.password_changed", entityType: "user", entityId: actor.userId });
  });
}
