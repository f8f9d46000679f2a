// Learner progress, the QA lead's roster, confirmatory results and the credentialing report
// (README "Progress and credentialing"). A sonographer sees only their own progress; a QA lead
// sees every sonographer of the program.
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { HttpError, notFound } from "../../http/errors";
import { idParamsSchema } from "../../../shared/schemas/common";
import { confirmationsInputSchema, progressQuerySchema, type Confirmation } from "../../../shared/schemas/progress";
import { computeProgress, roster } from "../../services/progress";
import { assertCanView } from "../../policies/exam";
import { audit } from "../../repositories/audit";
import { registerCredentialingReportRoute } from "./report";
import type { Db } from "../../db/knex";
import type { Knex } from "knex";

/** 404 unless the user is a sonographer of the program (active or not: history stays readable). */
async function assertSonographer(db: Db, programId: string, userId: string) {
  const member = await db("memberships").where({ program_id: programId, user_id: userId }).whereRaw(`'sonographer' = ANY(roles)`).first("id");
  if (!member) throw notFound("Sonographer");
}

async function confirmationsOf(db: Db | Knex.Transaction, examId: string, applicationId: string): Promise<Confirmation[]> {
  const rows = await db("application_findings as af")
    .join("exam_findings as f", function () {
      this.on("f.finding_key", "=", "af.key").andOnVal("f.exam_id", "=", examId);
    })
    .leftJoin("confirmations as c", function () {
      this.on("c.finding_key", "=", "af.key").andOnVal("c.exam_id", "=", examId);
    })
    .leftJoin("users as u", "u.id", "c.entered_by")
    .where("af.application_id", applicationId)
    .orderBy("af.position")
    .select("af.key", "af.label", "f.read", "c.method", "c.result", "c.note", "c.entered_at", "u.name as entered_by");
  return rows.map((r) => ({
    findingKey: r.key,
    label: r.label,
    sonographerRead: r.read,
    method: r.method ?? null,
    result: r.result ?? null,
    note: r.note ?? "",
    enteredBy: r.entered_by ?? null,
    enteredAt: r.entered_at ? r.entered_at.toISOString() : null,
  }));
}

export function registerProgressRoutes(kit: RouteKit, ctx: RouteContext) {
  const { db } = ctx;
  registerCredentialingReportRoute(kit, ctx);
  defineRoute(kit, {
    method: "get",
    path: "/me/progress",
    summary: "My progress: counts toward each application's threshold, learning curves, trends, strengths and focus areas, accuracy",
    tag: "progress",
    access: ["sonographer"],
    query: progressQuerySchema,
    responses: { 200: { description: "Progress" } },
    handler: async ({ user, query }) => (await computeProgress(db, user.programId, [user.id], query))[0],
  });

  defineRoute(kit, {
    method: "get",
    path: "/roster",
    summary: "Every sonographer of the program with progress per application, last activity and flags",
    tag: "progress",
    access: ["qa_lead"],
    responses: { 200: { description: "Roster" } },
    handler: async ({ user }) => ({ items: await roster(db, user.programId) }),
  });

  defineRoute(kit, {
    method: "get",
    path: "/roster/:id/progress",
    summary: "One sonographer's progress (QA lead)",
    tag: "progress",
    access: ["qa_lead"],
    params: idParamsSchema,
    query: progressQuerySchema,
    responses: { 200: { description: "Progress" }, 404: { description: "Not a sonographer of this program" } },
    handler: async ({ user, params, query }) => {
      await assertSonographer(db, user.programId, params.id);
      return (await computeProgress(db, user.programId, [params.id], query))[0];
    },
  });

  const loadExam = async (programId: string, id: string) =>
    db("exams").where({ id, program_id: programId }).first("id", "program_id", "sonographer_id", "status", "application_id");

  defineRoute(kit, {
    method: "get",
    path: "/exams/:id/confirmations",
    summary: "Confirmatory results (CT, formal echo, surgery, clinical follow-up) for each finding of an exam",
    tag: "progress",
    access: ["sonographer", "qa_lead"],
    params: idParamsSchema,
    responses: { 200: { description: "Confirmations" }, 404: { description: "No such exam of yours" } },
    handler: async ({ user, params }) => {
      const exam = await loadExam(user.programId, params.id);
      const access = await assertCanView(db, user, exam);
      if (access === "reviewer") throw notFound("Exam");
      return { items: await confirmationsOf(db, exam!.id, exam!.application_id) };
    },
  });

  defineRoute(kit, {
    method: "put",
    path: "/exams/:id/confirmations",
    summary:
      "Record what confirmatory tests later showed (the exam's sonographer or a QA lead); replaces the listed findings' entries, and method null clears one",
    tag: "progress",
    access: ["sonographer", "qa_lead"],
    params: idParamsSchema,
    body: confirmationsInputSchema,
    responses: { 200: { description: "Confirmations" }, 404: { description: "No such exam of yours" }, 409: { description: "The exam is still a draft" } },
    handler: async ({ req, user, params, body }) => {
      const exam = await loadExam(user.programId, params.id);
      const access = await assertCanView(db, user, exam);
      if (access === "reviewer") throw notFound("Exam");
      if (exam!.status === "draft") throw new HttpError(409, "exam_draft", "Confirmatory results can be entered once the exam is submitted");
      const findings = new Set(await db("exam_findings").where("exam_id", exam!.id).pluck("finding_key"));
      body.items.forEach((item, i) => {
        if (!findings.has(item.findingKey))
          throw new HttpError(400, "validation_failed", `items.${i}.findingKey: the exam has no finding "${item.findingKey}"`, [
            { path: `items.${i}.findingKey`, message: "not a finding of this exam" },
          ]);
      });
      return db.transaction(async (trx) => {
        for (const item of body.items)
          if (item.method === null) await trx("confirmations").where({ exam_id: exam!.id, finding_key: item.findingKey }).delete();
          else
            await trx("confirmations")
              .insert({
                exam_id: exam!.id,
                program_id: user.programId,
                finding_key: item.findingKey,
                method: item.method,
                result: item.result,
                note: item.note,
                entered_by: user.id,
                entered_at: trx.fn.now(),
              })
              .onConflict(["exam_id", "finding_key"])
              .merge();
        await audit(trx, {
          programId: user.programId,
          actorUserId: user.id,
          action: "confirmations.recorded",
          entityType: "exam",
          entityId: exam!.id,
          ip: req.ip,
          details: { items: body.items },
        });
        return { items: await confirmationsOf(trx, exam!.id, exam!.application_id) };
      });
    },
  });
}
