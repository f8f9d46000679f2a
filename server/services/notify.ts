// Telling people: in-app notifications and e-mails, both written in the caller's
// transaction (the e-mail into the outbox, delivered once the change commits; a
// rolled-back change never mails anyone).
import type { Knex } from "knex";
import type { Db } from "../db/knex";
import { queueMail } from "../mail/outbox";
import { programSettingsSchema } from "../../shared/schemas/reviews";
import { threadReviewers } from "../policies/exam";
import { overdueReadsByApplication } from "../repositories/assignments";
import { insertNotifications } from "../repositories/notifications";
import { feedbackReadyMail, overdueDigestMail, replyMail, urgentFollowUpMail } from "../mail/templates";

/** The sonographer's feedback is final: a notification and an e-mail. */
export async function feedbackReady(
  trx: Knex.Transaction,
  appUrl: string,
  exam: { id: string; program_id: string; sonographer_id: string; code: string },
): Promise<void> {
  const app = await trx("exams as e").join("applications as a", "a.id", "e.application_id").where("e.id", exam.id).first("a.name");
  const user = await trx("users").where("id", exam.sonographer_id).first("email", "name");
  await insertNotifications(trx, [
    {
      programId: exam.program_id,
      userId: exam.sonographer_id,
      kind: "feedback_ready",
      examId: exam.id,
      body: `Feedback on your ${app.name} exam ${exam.code} is ready.`,
    },
  ]);
  await queueMail(
    trx,
    feedbackReadyMail({ to: user.email, name: user.name, application: app.name, code: exam.code, link: `${appUrl}/feedback/${exam.id}` }),
    exam.program_id,
  );
}

/**
 * A read flagged "needs clinical follow-up now": every active QA lead of the program gets a
 * notification and an e-mail, and the program's on-call address (if set) an e-mail, in the
 * flagging transaction (delivered as soon as it commits). The exam is named by its code only.
 */
export async function urgentFollowUp(
  trx: Knex.Transaction,
  appUrl: string,
  f: { exam: { id: string; program_id: string; code: string }; reason: string; onCall: string; dueHours: number },
): Promise<void> {
  const app = await trx("exams as e").join("applications as a", "a.id", "e.application_id").where("e.id", f.exam.id).first("a.name");
  const leads = await trx("memberships as m")
    .join("users as u", "u.id", "m.user_id")
    .where("m.program_id", f.exam.program_id)
    .whereNull("m.deactivated_at")
    .whereRaw(`'qa_lead' = ANY(m.roles)`)
    .select("u.id", "u.email", "u.name");
  await insertNotifications(
    trx,
    leads.map((l) => ({
      programId: f.exam.program_id,
      userId: l.id,
      kind: "urgent_follow_up" as const,
      examId: f.exam.id,
      body: `Urgent: exam ${f.exam.code} (${app.name}) was flagged as needing clinical follow-up now.`,
    })),
  );
  const link = `${appUrl}/oversight/follow-ups`;
  const to = [...leads.map((l) => ({ email: l.email as string, name: l.name as string })), ...(f.onCall ? [{ email: f.onCall, name: "on-call team" }] : [])];
  const seen = new Set<string>();
  await queueMail(
    trx,
    to
      .filter((t) => !seen.has(t.email.toLowerCase()) && seen.add(t.email.toLowerCase()))
      .map((t) => urgentFollowUpMail({ to: t.email, name: t.name, code: f.exam.code, application: app.name, reason: f.reason, dueHours: f.dueHours, link })),
    f.exam.program_id,
  );
}

/** A sonographer's question reaches every reviewer who read the exam. */
export async function replyPosted(trx: Knex.Transaction, appUrl: string, exam: { id: string; program_id: string; code: string }, body: string): Promise<void> {
  const reviewers = await threadReviewers(trx, exam.id).distinct("u.id", "u.email", "u.name");
  await insertNotifications(
    trx,
    reviewers.map((r) => ({
      programId: exam.program_id,
      userId: r.id,
      kind: "feedback_reply" as const,
      examId: exam.id,
      body: `A question about exam ${exam.code}.`,
    })),
  );
  await queueMail(
    trx,
    reviewers.map((r) => replyMail({ to: r.email, name: r.name, code: exam.code, body, link: `${appUrl}/reviews/exams/${exam.id}` })),
    exam.program_id,
  );
}

/** Queues for each reviewer of each program a digest of primary/second reads waiting past the turnaround target. */
export async function sendOverdueDigests(db: Db, appUrl: string): Promise<number> {
  const programs = await db("programs").select("id", "name", "settings");
  let sent = 0;
  for (const p of programs) {
    const settings = programSettingsSchema.parse(p.settings ?? {});
    const hours = settings.turnaroundHours;
    const clinicalHours = settings.clinicalTurnaroundHours;
    const overdue = await overdueReadsByApplication(db, p.id, hours, clinicalHours);
    if (overdue.length === 0) continue;
    const reviewers = await db("memberships as m")
      .join("users as u", "u.id", "m.user_id")
      .where("m.program_id", p.id)
      .whereNull("m.deactivated_at")
      .whereRaw(`'reviewer' = ANY(m.roles)`)
      .select("u.email", "u.name");
    const rows = overdue.map((o) => ({ application: o.name, count: Number(o.count) }));
    await queueMail(
      db,
      reviewers.map((r) => overdueDigestMail({ to: r.email, name: r.name, programName: p.name, hours, clinicalHours, rows, link: `${appUrl}/queue` })),
      p.id,
    );
    sent += reviewers.length;
  }
  return sent;
}
