// Opening a session for a member: the session row, its token and cookie, the audit entry.
import type { Request, Response } from "express";
import type { Knex } from "knex";
import type { Config } from "../config";
import type { Db } from "../db/knex";
import { createSession } from "../repositories/sessions";
import { signSessionToken } from "../auth/tokens";
import { setSessionCookie } from "../auth/cookies";
import { audit } from "../repositories/audit";
import type { SessionUser } from "../../shared/schemas/auth";

/** Starts a session in `user.programId` and answers like POST /api/auth/login. */
export async function openSession(db: Db | Knex.Transaction, config: Config, req: Request, res: Response, user: SessionUser, action: string) {
  const sessionId = await createSession(db, {
    userId: user.id,
    programId: user.programId,
    ttlSeconds: config.sessionTtlSeconds,
    ip: req.ip,
    userAgent: req.get("user-agent"),
  });
  await db("users").where("id", user.id).update({ last_sign_in_at: db.fn.now() });
  await audit(db, { programId: user.programId, actorUserId: user.id, action, entityType: "user", entityId: user.id, ip: req.ip });
  const token = signSessionToken(config.jwtSecret, { sub: user.id, sid: sessionId, pid: user.programId }, config.sessionTtlSeconds);
  setSessionCookie(res, config, token);
  return { token, user };
}
