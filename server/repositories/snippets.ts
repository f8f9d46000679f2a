// The program's reusable feedback snippets (optionally tied to one rubric criterion).
import type { Knex } from "knex";
import type { Db } from "../db/knex";
import type { Snippet } from "../../shared/schemas/settings";

type Q = Db | Knex.Transaction;
const COLUMNS = ["id", "criterion_key as criterionKey", "text"] as const;

/** Every snippet of the program, grouped by criterion, oldest first within each. */
export function listSnippets(db: Q, programId: string): Promise<Snippet[]> {
  return db("snippets")
    .where("program_id", programId)
    .orderBy(["criterion_key", "created_at"])
    .select(...COLUMNS);
}

export async function insertSnippet(db: Q, s: { programId: string; criterionKey: string | null; text: string; createdBy: string }): Promise<Snippet> {
  const [row] = await db("snippets")
    .insert({ program_id: s.programId, criterion_key: s.criterionKey, text: s.text, created_by: s.createdBy })
    .returning([...COLUMNS]);
  return row;
}

/** Removes one snippet of the program; false when there was none with this id. */
export async function deleteSnippet(db: Q, programId: string, id: string): Promise<boolean> {
  return (await db("snippets").where({ id, program_id: programId }).delete()) > 0;
}

/** Every snippet of the program in the order they were written (the scoring workspace's list). */
export function snippetsByAge(db: Q, programId: string): Promise<Snippet[]> {
  return db("snippets")
    .where("program_id", programId)
    .orderBy("created_at")
    .select(...COLUMNS);
}
