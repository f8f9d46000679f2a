// Exam use cases: create and edit a draft, read one (what each viewer may see), submit it for
// review (which queues its reads and, by default, lets the originals go), discard it.
import type { z } from "zod";
import type { Db } from "../db/knex";
import { seal } from "../auth/sealed";
import type { Knex } from "knex";
import type { Config } from "../config";
import type { Storage } from "../storage/types";
import type { AuthUser } from "../auth/types";
import type { Actor } from "./actor";
import type { FindingRead } from "../../shared/catalogue";
import type { examCreateSchema, examListQuerySchema, examUpdateSchema } from "../../shared/schemas/exams";
import { HttpError } from "../http/errors";
import {
  applicationCodeOf,
  applicationFindingKeys,
  deleteExam,
  dropFindingsOutside,
  examDetail,
  examSetting,
  findActiveApplication,
  insertExam,
  listOwnExams,
  lockExam,
  markExamSubmitted,
  newExamCode,
  replaceFindings,
  updateExamColumns,
} from "../repositories/exams";
import { clipStatesOfExam, clipStorageKeys, forgetExamOriginals, storedClipsOfExam } from "../repositories/clips";
import { getSettings } from "../repositories/settings";
import { auditAs } from "../repositories/audit";
import { assertCanEdit, assertCanView, reviewerReadIsIn } from "../policies/exam";
import { queueSubmittedExam } from "./queue";
import type { ExamView } from "../presenters/exam";

export interface ExamDeps {
  db: Db;
  storage: Storage;
  config: Pick<Config, "originalRetention"> & { encounterKey?: Buffer | null };
  log: (msg: unknown) => void;
}

type Q = Db | Knex.Transaction;

/** Checks the application and the finding keys against the program's catalogue. */
async function resolveApplication(db: Q, programId: string, code: string, findings: { key: string; read: FindingRead }[] | undefined) {
  const app = await findActiveApplication(db, programId, code);
  if (!app)
    throw new HttpError(400, "validation_failed", `applicationCode: no active application "${code}" in this program`, [
      { path: "applicationCode", message: "Unknown application" },
    ]);
  if (findings?.length) {
    const known = new Set(await applicationFindingKeys(db, app.id));
    const bad = findings.findIndex((f) => !known.has(f.key));
    if (bad >= 0) {
      throw new HttpError(400, "validation_failed", `findings.${bad}.key: "${findings[bad].key}" is not a finding of this application`, [
        { path: `findings.${bad}.key`, message: "Unknown finding" },
      ]);
    }
  }
  return app;
}

/** The one place that decides what each viewer sees of an exam (blinding for reviewers); 404 when they may not see it. */
export async function examForViewer(db: Db, user: AuthUser, id: string): Promise<ExamView> {
  const d = await examDetail(db, user.programId, id);
  const access = await assertCanView(db, user, d?.exam);
  const { exam, findings, clips } = d!;
  if (access !== "reviewer") return { exam, findings, clips, identifySonographer: true, forOwner: access === "owner" };
  const settings = await getSettings(db, user.programId);
  // Before their own read is in, a reviewer sees neither who scanned nor what they read.
  const readDone = await reviewerReadIsIn(db, user.id, exam.id);
  return { exam, findings: readDone ? findings : [], clips, identifySonographer: !settings.blindSonographer, forOwner: false };
}

/** One page of the caller's own exams. */
export const listMyExams = (db: Db, user: AuthUser, query: z.output<typeof examListQuerySchema>) => listOwnExams(db, user.programId, user.id, query);

/** Creates a draft with the sonographer's own read of each finding. */
/** Seals and stores an exam's encounter reference ("" removes it); refused when the server has no key. */
async function setEncounterRef(trx: Knex.Transaction, key: Buffer | null | undefined, examId: string, ref: string) {
  if (ref && !key)
    throw new HttpError(503, "encounter_ref_unavailable", "encounterRef: this server is not set up to keep encounter references (ENCOUNTER_KEY)", [
      { path: "encounterRef", message: "Not set up on this server" },
    ]);
  await trx("exams")
    .where("id", examId)
    .update({ encounter_ref_sealed: ref ? seal(key!, examId, ref) : null });
}

export async function createExam(deps: ExamDeps, user: AuthUser, actor: Actor, body: z.output<typeof examCreateSchema>): Promise<ExamView> {
  const { db } = deps;
  const id = await db.transaction(async (trx) => {
    const app = await resolveApplication(trx, user.programId, body.applicationCode, body.findings);
    let row: { id: string } | undefined;
    // A code collision is astronomically rare; retry rather than fail.
    for (let i = 0; i < 5 && !row; i++) {
      row = await insertExam(trx, {
        program_id: user.programId,
        sonographer_id: user.id,
        application_id: app.id,
        code: newExamCode(),
        performed_at: body.performedAt,
        setting: body.setting,
        transducer: body.transducer,
        preset: body.preset,
        indication: body.indication,
      });
    }
    await replaceFindings(trx, row!.id, body.findings);
    if (body.encounterRef) await setEncounterRef(trx, deps.config.encounterKey, row!.id, body.encounterRef);
    await auditAs(trx, actor, { action: "exam.created", entityType: "exam", entityId: row!.id });
    return row!.id;
  });
  return examForViewer(db, user, id);
}

const EDITABLE = [
  ["performedAt", "performed_at"],
  ["setting", "setting"],
  ["transducer", "transducer"],
  ["preset", "preset"],
  ["indication", "indication"],
] as const;

/** Edits a draft; a new application drops the findings it does not ask about. */
export async function updateExam(deps: ExamDeps, user: AuthUser, actor: Actor, id: string, body: z.output<typeof examUpdateSchema>): Promise<ExamView> {
  const { db } = deps;
  await db.transaction(async (trx) => {
    const exam = await lockExam(trx, user.programId, id);
    assertCanEdit(user, exam);
    const currentCode = body.applicationCode ?? (await applicationCodeOf(trx, exam.application_id));
    const app = await resolveApplication(trx, user.programId, currentCode, body.findings);
    const changes: Record<string, unknown> = { application_id: app.id };
    for (const [field, column] of EDITABLE) {
      if (body[field] !== undefined) changes[column] = body[field];
    }
    await updateExamColumns(trx, exam.id, changes);
    if (body.encounterRef !== undefined) await setEncounterRef(trx, deps.config.encounterKey, exam.id, body.encounterRef);
    if (body.findings) await replaceFindings(trx, exam.id, body.findings);
    // Findings of another application do not carry over.
    else if (body.applicationCode) await dropFindingsOutside(trx, exam.id, app.id);
    await auditAs(trx, actor, { action: "exam.updated", entityType: "exam", entityId: exam.id });
  });
  return examForViewer(db, user, id);
}

/** Sends a draft to review: every clip processed (at least one); queues its reads. */
export async function submitExam(deps: ExamDeps, user: AuthUser, actor: Actor, id: string): Promise<ExamView> {
  const { db, storage, config, log } = deps;
  const originals = await db.transaction(async (trx) => {
    const exam = await lockExam(trx, user.programId, id);
    assertCanEdit(user, exam);
    const clips = await clipStatesOfExam(trx, exam.id);
    if (!clips.some((c) => c.state === "ready")) throw new HttpError(409, "no_ready_clip", "Add at least one clip and wait until it is processed");
    const waiting = clips.filter((c) => c.state !== "ready");
    if (waiting.length) {
      throw new HttpError(
        409,
        "clips_not_ready",
        `${waiting.length} clip(s) are still processing or failed: retry or remove them first`,
        waiting.map((c) => ({ clipId: c.id, state: c.state })),
      );
    }
    await markExamSubmitted(trx, exam.id);
    const settings = await getSettings(trx, user.programId);
    const { double } = await queueSubmittedExam(
      trx,
      { id: exam.id, program_id: exam.program_id, setting: await examSetting(trx, exam.id) },
      settings.doubleReadShare,
    );
    await auditAs(trx, actor, {
      action: "exam.submitted",
      entityType: "exam",
      entityId: exam.id,
      details: { attestNoIdentifiers: true, secondRead: double },
    });
    if (config.originalRetention === "delete_on_submit") {
      await forgetExamOriginals(trx, exam.id);
      return clips.map((c) => c.original_key).filter(Boolean) as string[];
    }
    return [];
  });
  // Originals may hold identifiers the sonographer redacted: once the exam is sent, they go.
  await Promise.all(originals.map((k) => storage.delete(k).catch(log)));
  return examForViewer(db, user, id);
}

/** Discards a draft with its clips and their media. */
export async function discardExam(deps: ExamDeps, user: AuthUser, actor: Actor, id: string): Promise<void> {
  const { db, storage, log } = deps;
  const keys = await db.transaction(async (trx) => {
    const exam = await lockExam(trx, user.programId, id);
    assertCanEdit(user, exam);
    const clips = await storedClipsOfExam(trx, exam.id);
    await deleteExam(trx, exam.id);
    await auditAs(trx, actor, { action: "exam.discarded", entityType: "exam", entityId: exam.id });
    return clips.flatMap(clipStorageKeys);
  });
  await Promise.all([...new Set(keys)].map((k) => storage.delete(k).catch(log)));
}
