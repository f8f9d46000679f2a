// Question threads: the messages about an exam's feedback (a sonographer's questions, the
// reviewers' and QA leads' answers), oldest first.
import type { Knex } from "knex";
import type { Db } from "../db/knex";

type Q = Db | Knex.Transaction;

export interface MessageRow {
  exam_id: string;
  id: string;
  body: string;
  created_at: Date;
  /** The author's name. */
  name: string;
  author_id: string;
}

/** The messages of the given exams with their authors' names, oldest first. */
export function messagesOf(db: Q, examIds: string[]): Promise<MessageRow[]> {
  return db("feedback_messages as m")
    .join("users as u", "u.id", "m.author_id")
    .whereIn("m.exam_id", examIds)
    .orderBy("m.created_at")
    .select("m.exam_id", "m.id", "m.body", "m.created_at", "u.name", "m.author_id");
}

export async function insertMessage(db: Q, m: { programId: string; examId: string; authorId: string; body: string }): Promise<{ id: string }> {
  const [row] = await db("feedback_messages").insert({ program_id: m.programId, exam_id: m.examId, author_id: m.authorId, body: m.body }).returning(["id"]);
  return { id: row.id };
}
