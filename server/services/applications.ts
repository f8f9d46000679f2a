// The program's application catalogue: every member reads the published versions; a QA lead
// or admin adds an application or saves one, which archives its published version and
// publishes the next (an unchanged save changes nothing). Exams keep the version they were
// recorded under, so a past exam's views and findings keep their labels. Each change is
// audited in its transaction.
import type { z } from "zod";
import type { Db } from "../db/knex";
import { HttpError, notFound } from "../http/errors";
import type { Application, applicationInputSchema, newApplicationSchema } from "../../shared/schemas/applications";
import {
  applicationCodeTaken,
  archiveApplicationVersion,
  getApplication,
  insertApplicationVersion,
  listApplications,
  lockApplication,
  nextApplicationPosition,
  versionsOf,
  type ApplicationContent,
} from "../repositories/applications";
import { auditAs } from "../repositories/audit";
import type { Actor } from "./actor";

type Input = z.output<typeof applicationInputSchema>;
type NewInput = z.output<typeof newApplicationSchema>;

export const programApplications = (db: Db, programId: string) => listApplications(db, programId);

export async function applicationById(db: Db, programId: string, id: string): Promise<Application> {
  const app = await getApplication(db, programId, id);
  if (!app) throw notFound("Application");
  return app;
}

/** The versions of the application this version belongs to, newest first. */
export async function applicationVersions(db: Db, programId: string, id: string) {
  const app = await applicationById(db, programId, id);
  return versionsOf(db, programId, app.code);
}

const contentOf = (input: Input): ApplicationContent => ({
  name: input.name,
  active: input.active,
  usualTransducers: input.usualTransducers,
  presets: input.presets,
  typicalDepthCm: input.typicalDepthCm,
  orientation: input.orientation,
  cautions: input.cautions,
  views: input.views,
  findings: input.findings,
  creditRule: input.creditRule,
});

const sameContent = (app: Application, content: ApplicationContent) => {
  const { id: _id, code: _code, version: _version, status: _status, publishedAt: _publishedAt, ...current } = app;
  return JSON.stringify(current) === JSON.stringify({ ...current, ...content });
};

/** Adds an application as version 1, after the program's others. */
export async function createApplication(db: Db, actor: Actor, input: NewInput): Promise<Application> {
  const id = await db.transaction(async (trx) => {
    // Serializes additions within the program so two adds of one code cannot both pass the check.
    await trx.raw("SELECT pg_advisory_xact_lock(hashtext('applications:' || ?))", [actor.programId]);
    if (await applicationCodeTaken(trx, actor.programId, input.code)) {
      const message = `The program already has an application with the code "${input.code}"`;
      throw new HttpError(409, "application_code_taken", `code: ${message}`, [{ path: "code", message }]);
    }
    const position = await nextApplicationPosition(trx, actor.programId);
    const id = await insertApplicationVersion(trx, {
      programId: actor.programId,
      code: input.code,
      version: 1,
      position,
      createdBy: actor.userId,
      content: contentOf(input),
    });
    await auditAs(trx, actor, { action: "application.created", entityType: "application", entityId: id, details: { code: input.code, version: 1 } });
    return id;
  });
  return applicationById(db, actor.programId, id);
}

/**
 * Saves the published version `id`: when anything changed, it is archived and the next
 * version published (same code and position); its exams keep the old version.
 */
export async function saveApplication(db: Db, actor: Actor, id: string, input: Input): Promise<Application> {
  const savedId = await db.transaction(async (trx) => {
    const row = await lockApplication(trx, actor.programId, id);
    if (!row) throw notFound("Application");
    if (row.status !== "published")
      throw new HttpError(409, "application_archived", `Version ${row.version} is archived; edit the current version of ${row.name} instead`);
    const content = contentOf(input);
    const current = (await getApplication(trx, actor.programId, id))!;
    if (sameContent(current, content)) return id;
    await archiveApplicationVersion(trx, row.id);
    const nextId = await insertApplicationVersion(trx, {
      programId: actor.programId,
      code: row.code,
      version: row.version + 1,
      position: row.position,
      createdBy: actor.userId,
      content,
    });
    await auditAs(trx, actor, {
      action: "application.new_version",
      entityType: "application",
      entityId: nextId,
      details: { code: row.code, from: row.version, to: row.version + 1 },
    });
    return nextId;
  });
  return applicationById(db, actor.programId, savedId);
}
