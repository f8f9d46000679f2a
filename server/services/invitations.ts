// Inviting people into a program and withdrawing an invitation (Setup → People), and the
// invitee's side: what an invitation offers, and accepting it.
import type { Request, Response } from "express";
import type { Config } from "../config";
import type { Db } from "../db/knex";
import { HttpError, notFound, validationError } from "../http/errors";
import { hashPassword, verifyPassword } from "../auth/passwords";
import { hashToken, newEmailToken } from "../auth/tokens";
import { invitationMail } from "../mail/templates";
import { queueMail } from "../mail/outbox";
import { acceptInvitationNewSchema } from "../../shared/schemas/auth";
import type { Role } from "../../shared/roles";
import {
  acceptInvitation as markAccepted,
  createInvitation,
  findOpenInvitation,
  listInvitations,
  revokeInvitation,
  revokeOpenInvitationsTo,
} from "../repositories/invitations";
import type { InvitationRow } from "../repositories/invitations";
import { activeMemberships, joinProgram, membershipByEmail } from "../repositories/members";
import { createAccount, findAccountByEmail, hasPasswordAccount, setPassword } from "../repositories/users";
import { auditAs } from "../repositories/audit";
import { assertNotActiveMember } from "../policies/membership";
import { openSession } from "./sign-in";
import type { Actor } from "./actor";

const INVITATION_HOURS = 72;

export const programInvitations = (db: Db, programId: string) => listInvitations(db, programId);

/**
 * Invites `email` into the actor's program with these roles, replacing any open invitation
 * to the same address. The e-mail is queued inside the transaction: if it cannot be queued,
 * no invitation is left behind.
 */
export async function invite(
  db: Db,
  config: Config,
  actor: Actor & { name: string; programName: string },
  input: { email: string; name?: string; roles: Role[] },
): Promise<InvitationRow> {
  assertNotActiveMember(await membershipByEmail(db, actor.programId, input.email), input.email);
  const { token, hash } = newEmailToken();
  return db.transaction(async (trx) => {
    await revokeOpenInvitationsTo(trx, actor.programId, input.email);
    const row = await createInvitation(trx, {
      programId: actor.programId,
      email: input.email,
      name: input.name ?? null,
      roles: input.roles,
      tokenHash: hash,
      invitedBy: actor.userId,
      inviterName: actor.name,
      hours: INVITATION_HOURS,
    });
    await auditAs(trx, actor, {
      action: "invitation.created",
      entityType: "invitation",
      entityId: row.id,
      details: { email: input.email, roles: input.roles },
    });
    await queueMail(
      trx,
      invitationMail({
        to: input.email,
        programName: actor.programName,
        roles: input.roles,
        inviter: actor.name,
        link: `${config.appUrl}/invitation?token=${token}`,
        expiresHours: INVITATION_HOURS,
      }),
      actor.programId,
    );
    return row;
  });
}

/** Revokes an open invitation of the actor's program; 404 when there is none with this id. */
export function withdrawInvitation(db: Db, actor: Actor, id: string): Promise<void> {
  return db.transaction(async (trx) => {
    if (!(await revokeInvitation(trx, actor.programId, id))) throw notFound("Invitation");
    await auditAs(trx, actor, { action: "invitation.revoked", entityType: "invitation", entityId: id });
  });
}

const invitationNotFound = () => new HttpError(404, "invitation_not_found", "This invitation is invalid, used, revoked or expired");

/** What an open invitation offers, for the accept page; 404 when it is not open. */
export async function previewInvitation(db: Db, token: string) {
  const inv = await findOpenInvitation(db, hashToken(token));
  if (!inv) throw invitationNotFound();
  return {
    email: inv.email,
    programName: inv.program_name,
    roles: inv.roles,
    existingUser: await hasPasswordAccount(db, inv.email),
    name: inv.name ?? null,
  };
}

/**
 * Accepts an invitation: a new person sets a name and password, an existing account proves
 * itself with its current password; then they join the program and are signed in to it.
 * The token is checked before any password is hashed.
 */
export async function acceptInvitation(db: Db, config: Config, req: Request, res: Response, body: { token: string; name?: string; password: string }) {
  const tokenHash = hashToken(body.token);
  // The token first: a bad one costs a lookup, never a hash.
  const open = await findOpenInvitation(db, tokenHash);
  if (!open) throw invitationNotFound();
  const existingAccount = await hasPasswordAccount(db, open.email);
  if (!existingAccount) {
    // A new person: the stricter rules of a new account apply.
    const strict = acceptInvitationNewSchema.safeParse(body);
    if (!strict.success) throw validationError(strict.error, "body");
  }
  // An existing account confirms its password instead; only a new password is hashed.
  const passwordHash = existingAccount ? undefined : await hashPassword(body.password, config.bcryptRounds);
  return db.transaction(async (trx) => {
    const inv = await findOpenInvitation(trx, tokenHash, { lock: true });
    if (!inv) throw invitationNotFound();
    const account = await findAccountByEmail(trx, inv.email, { lock: true });
    let userId: string;
    if (account?.password_hash) {
      // An existing account proves itself with its own password.
      if (!(await verifyPassword(body.password, account.password_hash, config.bcryptRounds))) {
        throw new HttpError(400, "wrong_password", "password: you already have an account; enter its current password to join");
      }
      userId = account.id;
    } else {
      const newHash = passwordHash ?? (await hashPassword(body.password, config.bcryptRounds));
      if (account) {
        await setPassword(trx, account.id, newHash, body.name!);
        userId = account.id;
      } else {
        userId = (await createAccount(trx, { email: inv.email, name: body.name!, passwordHash: newHash })).id;
      }
    }
    await joinProgram(trx, userId, inv.program_id, inv.roles);
    await markAccepted(trx, inv.id);
    const actor: Actor = { programId: inv.program_id, userId, ip: req.ip ?? null };
    await auditAs(trx, actor, { action: "invitation.accepted", entityType: "invitation", entityId: inv.id });
    const me = (await activeMemberships(trx, userId)).find((m) => m.programId === inv.program_id)!;
    return openSession(trx, config, req, res, me, "auth.signed_in");
  });
}
