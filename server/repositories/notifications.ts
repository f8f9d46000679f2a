// In-app notifications, always of one user.
import type { Knex } from "knex";
import type { Db } from "../db/knex";

type Q = Db | Knex.Transaction;

/** Marks the user's unread notifications of one kind about one exam as read. */
export async function markExamNotificationsRead(db: Q, userId: string, examId: string, kind: string) {
  await db("notifications").where({ user_id: userId, exam_id: examId, kind }).whereNull("read_at").update({ read_at: db.fn.now() });
}
