// The program's feedback snippets: listing, adding and removing them (each change audited).
import type { Db } from "../db/knex";
import { notFound } from "../http/errors";
import type { Snippet } from "../../shared/schemas/settings";
import { deleteSnippet, insertSnippet, listSnippets } from "../repositories/snippets";
import { auditAs } from "../repositories/audit";
import type { Actor } from "./actor";

export const programSnippets = (db: Db, programId: string) => listSnippets(db, programId);

export function addSnippet(db: Db, actor: Actor, input: { criterionKey: string | null; text: string }): Promise<Snippet> {
  return db.transaction(async (trx) => {
    const snippet = await insertSnippet(trx, { programId: actor.programId, criterionKey: input.criterionKey, text: input.text, createdBy: actor.userId });
    await auditAs(trx, actor, { action: "snippet.created", entityType: "snippet", entityId: snippet.id });
    return snippet;
  });
}

/** Removes a snippet of the caller's program; 404 when there is none with this id. */
export function removeSnippet(db: Db, actor: Actor, id: string): Promise<void> {
  return db.transaction(async (trx) => {
    if (!(await deleteSnippet(trx, actor.programId, id))) throw notFound("Snippet");
    await auditAs(trx, actor, { action: "snippet.deleted", entityType: "snippet", entityId: id });
  });
}
