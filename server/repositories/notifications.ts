// In-app notifications, always of one user: written with the change they tell of (in its
// transaction), listed unread first, marked read by their user.
import type { Knex } from "knex";
import type { Db } from "../db/knex";

type Q = Db | Knex.Transaction;

export type NotificationKind = "feedback_ready" | "feedback_reply" | "feedback_answer" | "urgent_follow_up";

export interface NewNotification {
  programId: string;
  userId: string;
  kind: NotificationKind;
  examId: string;
  body: string;
}

export interface NotificationRow {
  id: string;
  kind: string;
  exam_id: string | null;
  body: string;
  read_at: Date | null;
  created_at: Date;
}

export async function insertNotifications(db: Q, items: NewNotification[]): Promise<void> {
  if (items.length === 0) return;
  await db("notifications").insert(items.map((n) => ({ program_id: n.programId, user_id: n.userId, kind: n.kind, exam_id: n.examId, body: n.body })));
}

/** The user's newest notifications in the program, unread first. */
export function listNotifications(db: Q, programId: string, userId: string, limit = 100): Promise<NotificationRow[]> {
  return db("notifications")
    .where({ user_id: userId, program_id: programId })
    .orderByRaw("read_at IS NOT NULL, created_at DESC")
    .limit(limit)
    .select("id", "kind", "exam_id", "body", "read_at", "created_at");
}

/** Marks the user's unread notifications read: the listed ones, or all when `ids` is absent. */
export async function markNotificationsRead(db: Q, userId: string, ids?: string[]): Promise<void> {
  const q = db("notifications").where({ user_id: userId }).whereNull("read_at");
  if (ids) q.whereIn("id", ids);
  await q.update({ read_at: db.fn.now() });
}

/** Marks read the user's unread notifications of one kind about one exam. */
export async function markExamNotificationsRead(db: Q, userId: string, examId: string, kind: NotificationKind): Promise<void> {
  await db("notifications").where({ user_id: userId, exam_id: examId, kind }).whereNull("read_at").update({ read_at: db.fn.now() });
}

/** Exams whose feedback-ready notification the user has not read yet. */
export async function unreadFeedbackExamIds(db: Q, userId: string): Promise<Set<string>> {
  return new Set(await db("notifications").where({ user_id: userId, kind: "feedback_ready" }).whereNull("read_at").pluck("exam_id"));
}

/** Unread feedback-ready notifications of the given users in the program. */
export function unreadFeedbackOf(db: Q, programId: string, userIds: string[]): Promise<{ user_id: string; exam_id: string }[]> {
  return db("notifications")
    .where({ program_id: programId, kind: "feedback_ready" })
    .whereIn("user_id", userIds)
    .whereNull("read_at")
    .select("user_id", "exam_id");
}
