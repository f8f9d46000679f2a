// Feedback to the sonographer (README "Review rules", "Feedback"): reviewed exams with the
// final scores, anchor texts, the reviewers' comments and next steps, as their sonographer
// or a QA lead sees them; reading one marks its notification read; acknowledging it.
import type { Db } from "../db/knex";
import type { AuthUser } from "../auth/types";
import type { Actor } from "./actor";
import { notFound } from "../http/errors";
import { creditFor, criteriaFor } from "../../shared/rubric/logic";
import { getRubric } from "../repositories/rubrics";
import { getSettings } from "../repositories/settings";
import { auditAs } from "../repositories/audit";
import {
  criterionSnippets,
  decidingComments,
  findingOutcomesOf,
  markFeedbackAcknowledged,
  reviewedExamAcknowledgement,
  reviewedExams,
  type ReviewedExamRow,
} from "../repositories/feedback";
import { messagesOf } from "../repositories/messages";
import { markExamNotificationsRead, unreadFeedbackExamIds } from "../repositories/notifications";
import { assertProgramSonographer } from "../policies/progress";
import type { Acknowledgement, Feedback, FeedbackList } from "../../shared/schemas/feedback";

/** How many reviewed exams a feedback list holds (newest first). */
const LIST_LIMIT = 200;

/**
 * Reviewed exams' feedback as `viewer` sees it, in the order of `rows`, built with one query
 * per kind of row for the whole list. `lead` views (a QA lead's page about a sonographer)
 * always carry the reviewers' names.
 */
async function feedbackItems(db: Db, viewer: AuthUser, rows: ReviewedExamRow[], lead = false): Promise<Feedback[]> {
  if (rows.length === 0) return [];
  const ids = rows.map((r) => r.id);
  const [rubrics, programSettings, reviews, outcomes, snippets, messages] = await Promise.all([
    Promise.all([...new Set(rows.map((r) => r.rubric_id))].map((id) => getRubric(db, viewer.programId, id))),
    getSettings(db, viewer.programId),
    decidingComments(db, ids),
    findingOutcomesOf(db, ids),
    criterionSnippets(db, viewer.programId),
    messagesOf(db, ids),
  ]);
  const settings = lead ? { ...programSettings, showReviewerName: true } : programSettings;
  const of = <T extends { exam_id: string }>(list: T[], examId: string) => list.filter((x) => x.exam_id === examId);
  return rows.map((row) => {
    const rubric = rubrics.find((r) => r?.id === row.rubric_id);
    const findings = of(outcomes, row.id).map(({ exam_id: _, ...o }) => o);
    const criteria = rubric ? criteriaFor(rubric.criteria, row.app_code) : [];
    // The reasons kept with the result when it was decided; results decided before they were kept are worked out again.
    const misreads = findings.filter((o) => o.outcome === "FP" || o.outcome === "FN").map((o) => o.label);
    const creditReasons =
      row.credit || row.credit_reasons.length > 0 || !rubric
        ? row.credit_reasons
        : creditFor(
            rubric.criteria,
            row.app_code,
            row.scores,
            { misreads, missingViews: [], limited: row.limited },
            { minQuality: settings.minQualityForCredit },
          ).reasons;
    const scored = criteria.map((c) => {
      const value = row.scores[c.key];
      const level = c.levels.find((l) => l.value === String(value));
      const nextSteps = level && !level.ideal ? [c.help, ...snippets.filter((sn) => sn.criterion_key === c.key).map((sn) => sn.text)].filter(Boolean) : [];
      return {
        key: c.key,
        label: c.label,
        value: value ?? null,
        level: level ? { label: level.label, anchor: level.anchor, ideal: level.ideal, fails: level.fails } : null,
        nextSteps,
      };
    });
    return {
      examId: row.id,
      code: row.code,
      application: { code: row.app_code, name: row.app_name },
      guide: { applicationId: row.application_id, version: row.app_version, orientation: row.app_orientation, cautions: row.app_cautions },
      performedAt: row.performed_at.toISOString(),
      setting: row.setting,
      reviewedAt: row.decided_at.toISOString(),
      source: row.source,
      credit: row.credit,
      creditReasons,
      rubricVersion: rubric?.version ?? null,
      criteria: scored,
      findings,
      comments: of(reviews, row.id)
        .filter((r) => r.feedback)
        .map((r) => ({ reviewer: settings.showReviewerName ? r.name : null, text: r.feedback, at: r.submitted_at.toISOString() })),
      adjudicationNote: row.note || null,
      acknowledgedAt: row.feedback_acknowledged_at?.toISOString() ?? null,
      messages: of(messages, row.id).map((m) => ({
        id: m.id,
        body: m.body,
        at: m.created_at.toISOString(),
        author: m.author_id === viewer.id ? "you" : settings.showReviewerName ? m.name : "Reviewer",
      })),
    };
  });
}

async function feedbackList(db: Db, viewer: AuthUser, sonographerId: string, lead: boolean): Promise<FeedbackList> {
  const rows = await reviewedExams(db, viewer.programId, sonographerId, { newest: LIST_LIMIT });
  const items = await feedbackItems(db, viewer, rows, lead);
  const unread = await unreadFeedbackExamIds(db, sonographerId);
  return { items: items.map((f) => ({ ...f, unread: unread.has(f.examId) })) };
}

/** The caller's own reviewed exams with their feedback, newest first. */
export const myFeedback = (db: Db, user: AuthUser) => feedbackList(db, user, user.id, false);

/** A sonographer's reviewed exams with their feedback and the reviewers' names, for a QA lead. */
export async function sonographerFeedback(db: Db, lead: AuthUser, sonographerId: string): Promise<FeedbackList> {
  await assertProgramSonographer(db, lead.programId, sonographerId);
  return feedbackList(db, lead, sonographerId, true);
}

/** The feedback on one of the caller's exams; reading it marks its notification read. */
export async function openFeedback(db: Db, user: AuthUser, examId: string): Promise<Feedback> {
  const [item] = await feedbackItems(db, user, await reviewedExams(db, user.programId, user.id, { examId }));
  if (!item) throw notFound("Feedback");
  await markExamNotificationsRead(db, user.id, examId, "feedback_ready");
  return item;
}

/** The sonographer has read the feedback on their exam (once; later calls answer the first time). */
export async function acknowledgeFeedback(db: Db, actor: Actor, examId: string): Promise<Acknowledgement> {
  return db.transaction(async (trx) => {
    const row = await reviewedExamAcknowledgement(trx, actor.programId, actor.userId, examId);
    if (!row) throw notFound("Feedback");
    const at = row.feedback_acknowledged_at ?? new Date();
    if (!row.feedback_acknowledged_at) {
      await markFeedbackAcknowledged(trx, row.id, at);
      await auditAs(trx, actor, { action: "feedback.acknowledged", entityType: "exam", entityId: row.id });
    }
    return { acknowledgedAt: at.toISOString() };
  });
}
