// Questions about feedback (README "Review rules", "Feedback"): the exam's sonographer asks,
// which notifies the exam's reviewers; a reviewer of the exam or a QA lead answers, which
// notifies the sonographer. Reviewers stay blinded to who asked.
import type { Db } from "../db/knex";
import type { AuthUser } from "../auth/types";
import type { Actor } from "./actor";
import { HttpError } from "../http/errors";
import { assertCanView } from "../policies/exam";
import { feedbackExam } from "../repositories/feedback";
import { getSettings } from "../repositories/settings";
import { auditAs } from "../repositories/audit";
import { insertMessage, messagesOf } from "../repositories/messages";
import { insertNotifications } from "../repositories/notifications";
import { replyPosted } from "./notify";
import type { MessageThread } from "../../shared/schemas/feedback";

/** The thread about an exam's feedback, each author named as the caller may see them. */
export async function messageThread(db: Db, user: AuthUser, examId: string): Promise<MessageThread> {
  const exam = await feedbackExam(db, user.programId, examId);
  const access = await assertCanView(db, user, exam, "thread");
  const [settings, rows] = await Promise.all([getSettings(db, user.programId), messagesOf(db, [exam!.id])]);
  // Reviewers see the sonographer only as "Sonographer" while blinding is on.
  const name = (r: { author_id: string; name: string }) =>
    r.author_id === user.id
      ? "you"
      : r.author_id === exam!.sonographer_id
        ? access === "reviewer" && settings.blindSonographer
          ? "Clinician"
          : r.name
        : access === "owner" && !settings.showReviewerName
          ? "Reviewer"
          : r.name;
  return { examCode: exam!.code, items: rows.map((r) => ({ id: r.id, body: r.body, at: r.created_at.toISOString(), author: name(r) })) };
}

/** Posts a question (the exam's sonographer) or an answer (a reviewer of the exam, a QA lead) once the feedback is final. */
export async function postMessage(db: Db, appUrl: string, user: AuthUser, actor: Actor, examId: string, body: string): Promise<{ id: string }> {
  const exam = await feedbackExam(db, user.programId, examId);
  const access = await assertCanView(db, user, exam, "thread");
  if (exam!.status !== "reviewed") throw new HttpError(409, "not_reviewed", "Questions open once the feedback is final");
  return db.transaction(async (trx) => {
    const posted = await insertMessage(trx, { programId: actor.programId, examId: exam!.id, authorId: actor.userId, body });
    await auditAs(trx, actor, { action: "feedback.message_posted", entityType: "exam", entityId: exam!.id });
    if (access === "owner") await replyPosted(trx, appUrl, exam!, body);
    else
      await insertNotifications(trx, [
        { programId: actor.programId, userId: exam!.sonographer_id, kind: "feedback_answer", examId: exam!.id, body: `An answer about exam ${exam!.code}.` },
      ]);
    return posted;
  });
}
