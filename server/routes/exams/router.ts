// Exams: create and edit drafts, list my exams, read one, submit for review, discard.
import { z } from "zod";
import type { Knex } from "knex";
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { HttpError } from "../../http/errors";
import { idParamsSchema } from "../../../shared/schemas/common";
import { examCreateSchema, examListItemSchema, examListQuerySchema, examSchema, examUpdateSchema, submitExamSchema } from "../../../shared/schemas/exams";
import { examDetail, findExam, listOwnExams, newExamCode, replaceFindings } from "../../repositories/exams";
import { presentExam, presentExamListItem } from "../../presenters/exam";
import { assertCanEdit, assertCanView } from "../../policies/exam";
import { getSettings } from "../../repositories/settings";
import { audit } from "../../repositories/audit";
import { queueSubmittedExam } from "../../services/queue";
import type { AuthUser } from "../../auth/types";
import type { FindingRead } from "../../../shared/catalogue";

/** Checks the application and the finding keys against the program's catalogue. */
async function resolveApplication(db: Knex | Knex.Transaction, programId: string, code: string, findings: { key: string; read: FindingRead }[] | undefined) {
  const app = await db("applications").where({ program_id: programId, code, active: true }).first("id", "code");
  if (!app)
    throw new HttpError(400, "validation_failed", `applicationCode: no active application "${code}" in this program`, [
      { path: "applicationCode", message: "Unknown application" },
    ]);
  if (findings?.length) {
    const known = new Set((await db("application_findings").where("application_id", app.id).select("key")).map((r) => r.key));
    const bad = findings.findIndex((f) => !known.has(f.key));
    if (bad >= 0) {
      throw new HttpError(400, "validation_failed", `findings.${bad}.key: "${findings[bad].key}" is not a finding of this application`, [
        { path: `findings.${bad}.key`, message: "Unknown finding" },
      ]);
    }
  }
  return app as { id: string; code: string };
}

export function registerExamRoutes(kit: RouteKit, { db, storage, config, log }: RouteContext) {
  // The one place that decides what each viewer sees of an exam (blinding for reviewers).
  const detail = async (user: AuthUser, id: string) => {
    const d = await examDetail(db, user.programId, id);
    const access = await assertCanView(db, user, d?.exam);
    const { exam, findings, clips } = d!;
    if (access !== "reviewer") return presentExam(exam, findings, clips, { identifySonographer: true, forOwner: access === "owner" });
    const settings = await getSettings(db, user.programId);
    const readDone = await db("reviews").where({ exam_id: exam.id, reviewer_id: user.id }).first("id");
    // Before their own read is in, a reviewer sees neither who scanned nor what they read.
    return presentExam(exam, readDone ? findings : [], clips, { identifySonographer: !settings.blindSonographer, forOwner: false });
  };

  defineRoute(kit, {
    method: "post",
    path: "/exams",
    summary: "Create an exam (a draft) with the sonographer's own read of each finding",
    tag: "exams",
    access: ["sonographer"],
    body: examCreateSchema,
    responses: { 201: { description: "Created", schema: z.object({ exam: examSchema }) } },
    handler: async ({ req, res, user, body }) => {
      const id = await db.transaction(async (trx) => {
        const app = await resolveApplication(trx, user.programId, body.applicationCode, body.findings);
        let row: { id: string } | undefined;
        // A code collision is astronomically rare; retry rather than fail.
        for (let i = 0; i < 5 && !row; i++) {
          [row] = await trx("exams")
            .insert({
              program_id: user.programId,
              sonographer_id: user.id,
              application_id: app.id,
              code: newExamCode(),
              performed_at: body.performedAt,
              setting: body.setting,
              transducer: body.transducer,
              preset: body.preset,
              indication: body.indication,
            })
            .onConflict(["program_id", "code"])
            .ignore()
            .returning("id");
        }
        await replaceFindings(trx, row!.id, body.findings);
        await audit(trx, { programId: user.programId, actorUserId: user.id, action: "exam.created", entityType: "exam", entityId: row!.id, ip: req.ip });
        return row!.id;
      });
      res.status(201).json({ exam: await detail(user, id) });
    },
  });

  defineRoute(kit, {
    method: "get",
    path: "/exams",
    summary: "My exams, filtered, sorted and paged on the server",
    tag: "exams",
    access: ["sonographer"],
    query: examListQuerySchema,
    responses: { 200: { description: "A page of exams", schema: z.object({ items: z.array(examListItemSchema), total: z.number() }) } },
    handler: async ({ user, query }) => {
      const { rows, total } = await listOwnExams(db, user.programId, user.id, query);
      return { items: rows.map(presentExamListItem), total };
    },
  });

  defineRoute(kit, {
    method: "get",
    path: "/exams/:id",
    summary: "One exam with its clips, their processing state and media URLs",
    tag: "exams",
    access: "signed_in",
    params: idParamsSchema,
    responses: { 200: { description: "The exam", schema: z.object({ exam: examSchema }) }, 404: { description: "No such exam visible to you" } },
    handler: async ({ user, params }) => ({ exam: await detail(user, params.id) }),
  });

  defineRoute(kit, {
    method: "patch",
    path: "/exams/:id",
    summary: "Edit a draft exam",
    tag: "exams",
    access: ["sonographer"],
    params: idParamsSchema,
    body: examUpdateSchema,
    responses: { 200: { description: "Updated", schema: z.object({ exam: examSchema }) }, 409: { description: "Already submitted" } },
    handler: async ({ req, user, params, body }) => {
      await db.transaction(async (trx) => {
        const exam = await findExam(trx, user.programId, params.id).forUpdate();
        assertCanEdit(user, exam);
        const currentCode = body.applicationCode ?? (await trx("applications").where("id", exam.application_id).first("code")).code;
        const app = await resolveApplication(trx, user.programId, currentCode, body.findings);
        const changes: Record<string, unknown> = { updated_at: trx.fn.now(), application_id: app.id };
        for (const [field, column] of [
          ["performedAt", "performed_at"],
          ["setting", "setting"],
          ["transducer", "transducer"],
          ["preset", "preset"],
          ["indication", "indication"],
        ] as const) {
          if (body[field] !== undefined) changes[column] = body[field];
        }
        await trx("exams").where("id", exam.id).update(changes);
        if (body.findings) await replaceFindings(trx, exam.id, body.findings);
        else if (body.applicationCode) {
          // Findings of another application do not carry over.
          await trx("exam_findings")
            .where("exam_id", exam.id)
            .whereNotIn("finding_key", trx("application_findings").where("application_id", app.id).select("key"))
            .delete();
        }
        await audit(trx, { programId: user.programId, actorUserId: user.id, action: "exam.updated", entityType: "exam", entityId: exam.id, ip: req.ip });
      });
      return { exam: await detail(user, params.id) };
    },
  });

  defineRoute(kit, {
    method: "post",
    path: "/exams/:id/submit",
    summary: "Send a draft to review: needs the attestation and every clip processed (at least one)",
    tag: "exams",
    access: ["sonographer"],
    params: idParamsSchema,
    body: submitExamSchema,
    responses: { 200: { description: "Submitted", schema: z.object({ exam: examSchema }) }, 409: { description: "Not ready to submit" } },
    handler: async ({ req, user, params }) => {
      const originals = await db.transaction(async (trx) => {
        const exam = await findExam(trx, user.programId, params.id).forUpdate();
        assertCanEdit(user, exam);
        const clips = await trx("clips").where("exam_id", exam.id).select("id", "state", "original_key");
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
        await trx("exams")
          .where("id", exam.id)
          .update({ status: "submitted", submitted_at: trx.fn.now(), attested_at: trx.fn.now(), updated_at: trx.fn.now() });
        const settings = await getSettings(trx, user.programId);
        const { double } = await queueSubmittedExam(
          trx,
          { id: exam.id, program_id: exam.program_id, setting: (await trx("exams").where("id", exam.id).first("setting")).setting },
          settings.doubleReadShare,
        );
        await audit(trx, {
          programId: user.programId,
          actorUserId: user.id,
          action: "exam.submitted",
          entityType: "exam",
          entityId: exam.id,
          ip: req.ip,
          details: { attestNoIdentifiers: true, secondRead: double },
        });
        if (config.originalRetention === "delete_on_submit") {
          await trx("clips").where("exam_id", exam.id).update({ original_key: null });
          return clips.map((c) => c.original_key).filter(Boolean) as string[];
        }
        return [];
      });
      // Originals may hold identifiers the sonographer redacted: once the exam is sent, they go.
      await Promise.all(originals.map((k) => storage.delete(k).catch(log)));
      return { exam: await detail(user, params.id) };
    },
  });

  defineRoute(kit, {
    method: "delete",
    path: "/exams/:id",
    summary: "Discard a draft exam and its clips",
    tag: "exams",
    access: ["sonographer"],
    params: idParamsSchema,
    responses: { 204: { description: "Discarded" }, 409: { description: "Already submitted" } },
    handler: async ({ req, user, params }) => {
      const keys = await db.transaction(async (trx) => {
        const exam = await findExam(trx, user.programId, params.id).forUpdate();
        assertCanEdit(user, exam);
        const clips = await trx("clips").where("exam_id", exam.id);
        await trx("exams").where("id", exam.id).delete();
        await audit(trx, { programId: user.programId, actorUserId: user.id, action: "exam.discarded", entityType: "exam", entityId: exam.id, ip: req.ip });
        return clips.flatMap((c) => [c.original_key, c.output_key, c.poster_key, c.strip_key, c.thumb_key]).filter(Boolean) as string[];
      });
      await Promise.all([...new Set(keys)].map((k) => storage.delete(k).catch(log)));
    },
  });
}
