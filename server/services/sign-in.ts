// Signing in and moving between programs: checking the password (at the same cost for known
// and unknown addresses), opening a session (its row, token and cookie, the audit entry) and
// ending the one it replaces.
import type { Request, Response } from "express";
import type { Knex } from "knex";
import type { Config } from "../config";
import type { Db } from "../db/knex";
import { HttpError } from "../http/errors";
import { hashCost, hashPassword, verifyPassword } from "../auth/passwords";
import { createSession, endSession } from "../repositories/sessions";
import { findAccountByEmail, markSignedIn, renewPasswordHash } from "../repositories/users";
import { activeMemberships } from "../repositories/members";
import { signSessionToken } from "../auth/tokens";
import { setSessionCookie } from "../auth/cookies";
import { audit, auditAs } from "../repositories/audit";
import type { z } from "zod";
import type { loginSchema, SessionUser } from "../../shared/schemas/auth";

const invalidCredentials = () => new HttpError(401, "invalid_credentials", "E-mail or password is incorrect");

/** Starts a session in `user.programId` and answers like POST /api/auth/login. */
export async function openSession(db: Db | Knex.Transaction, config: Config, req: Request, res: Response, user: SessionUser, action: string) {
  const sessionId = await createSession(db, {
    userId: user.id,
    programId: user.programId,
    ttlSeconds: config.sessionTtlSeconds,
    ip: req.ip,
    userAgent: req.get("user-agent"),
  });
  await markSignedIn(db, user.id);
  await auditAs(db, { programId: user.programId, userId: user.id, ip: req.ip ?? null }, { action, entityType: "user", entityId: user.id });
  const token = signSessionToken(config.jwtSecret, { sub: user.id, sid: sessionId, pid: user.programId }, config.sessionTtlSeconds);
  setSessionCookie(res, config, token);
  return { token, user };
}

/**
 * Signs in with e-mail and password into the chosen program (else the oldest membership).
 * A wrong password, an unknown address and an account without an active membership all
 * answer 401 alike and are logged as a failed sign-in.
 */
export async function signIn(db: Db, config: Config, req: Request, res: Response, body: z.output<typeof loginSchema>) {
  const user = await findAccountByEmail(db, body.email);
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
  if (hashCost(user!.password_hash!) !== config.bcryptRounds) {
    const renewed = await hashPassword(body.password, config.bcryptRounds);
    await renewPasswordHash(db, user!.id, user!.password_hash!, renewed);
  }
  return db.transaction((trx) => openSession(trx, config, req, res, chosen, "auth.signed_in"));
}

/** The programs the user belongs to, marking the one this session is in. */
export async function myPrograms(db: Db, user: { id: string; programId: string }) {
  return {
    programs: (await activeMemberships(db, user.id)).map((m) => ({
      id: m.programId,
      name: m.programName,
      roles: m.roles,
      current: m.programId === user.programId,
    })),
  };
}

/** Moves the session to another program the user belongs to: a new session, the old one ends. */
export async function switchProgram(db: Db, config: Config, req: Request, res: Response, user: { id: string; sessionId: string }, programId: string) {
  const target = (await activeMemberships(db, user.id)).find((m) => m.programId === programId);
  if (!target) throw new HttpError(404, "not_found", "programId: you are not an active member of that program");
  return db.transaction(async (trx) => {
    await endSession(trx, user.sessionId, "switched_program");
    return openSession(trx, config, req, res, target, "auth.switched_program");
  });
}
