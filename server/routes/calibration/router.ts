// Calibration sets: the QA lead picks exams (optionally with a reference answer) and sends
// them to all or some reviewers as blinded calibration reads; the results show multi-rater
// agreement per criterion (Fleiss' kappa, Krippendorff's alpha) and each reviewer against
// the reference.
import type { Knex } from "knex";
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { HttpError, notFound } from "../../http/errors";
import { idParamsSchema } from "../../../shared/schemas/common";
import { activeRubricFor, getRubric } from "../../repositories/rubrics";
import { audit } from "../../repositories/audit";
import { criteriaFor } from "../../../shared/rubric/logic";
import { createCalibrationSetSchema, type ReferenceAnswer } from "./schema";
import { referenceIssues } from "./reference";
import { calibrationResults } from "./results";

/** Each application's findings (key and label), in catalogue order, for the given application ids. */
async function findingsByApplication(db: Knex | Knex.Transaction, applicationIds: string[]) {
  const rows: { application_id: string; key: string; label: string }[] = await db("application_findings")
    .whereIn("application_id", [...new Set(applicationIds)])
    .orderBy(["application_id", "position"])
    .select("application_id", "key", "label");
  const out = new Map<string, { key: string; label: string }[]>();
  for (const r of rows) out.set(r.application_id, [...(out.get(r.application_id) ?? []), { key: r.key, label: r.label }]);
  return out;
}

const reviewerError = (message: string) => new HttpError(400, "validation_failed", `reviewerIds: ${message}`, [{ path: "reviewerIds", message }]);

export function registerCalibrationRoutes(kit: RouteKit, { db }: RouteContext) {
  defineRoute(kit, {
    method: "post",
    path: "/calibration-sets",
    summary: "Send chosen exams to reviewers as blinded calibration reads",
    tag: "calibration",
    access: ["qa_lead"],
    body: createCalibrationSetSchema,
    responses: { 201: { description: "Created" } },
    handler: async ({ req, res, user, body }) => {
      const id = await db.transaction(async (trx) => {
        const examIds = body.exams.map((e) => e.examId);
        const exams: { id: string; sonographer_id: string; application_id: string; app_code: string }[] = await trx("exams as e")
          .join("applications as ap", "ap.id", "e.application_id")
          .where("e.program_id", user.programId)
          .whereIn("e.id", examIds)
          .whereNot("e.status", "draft")
          .select("e.id", "e.sonographer_id", "e.application_id", "ap.code as app_code");
        const missing = examIds.findIndex((x) => !exams.some((e) => e.id === x));
        if (missing >= 0) {
          const message = "No submitted exam with this id in the program";
          throw new HttpError(400, "validation_failed", `exams.${missing}.examId: ${message}`, [{ path: `exams.${missing}.examId`, message }]);
        }
        const reviewerRows = trx("memberships").where("program_id", user.programId).whereNull("deactivated_at").whereRaw(`'reviewer' = ANY(roles)`);
        if (body.reviewerIds) reviewerRows.whereIn("user_id", body.reviewerIds);
        const reviewers: string[] = await reviewerRows.pluck("user_id");
        if (body.reviewerIds && reviewers.length !== new Set(body.reviewerIds).size) throw reviewerError("every id must be an active reviewer of this program");
        if (reviewers.length < 2) throw reviewerError("calibration needs at least two reviewers");
        const rubric = await activeRubricFor(trx, user.programId);
        if (!rubric) throw new HttpError(409, "no_rubric", "Publish a rubric first");
        // A reference answer must be an answer a reviewer could give: the calibration reads' rubric, the exam's findings.
        const findings = await findingsByApplication(
          trx,
          exams.map((e) => e.application_id),
        );
        const issues = body.exams.flatMap((item, i) => {
          if (!item.reference) return [];
          const exam = exams.find((e) => e.id === item.examId)!;
          const keys = (findings.get(exam.application_id) ?? []).map((f) => f.key);
          return referenceIssues(rubric.criteria, exam.app_code, rubric.version, keys, item.reference).map((issue) => ({
            path: issue.path === "reference" ? `exams.${i}.reference` : `exams.${i}.reference.${issue.path}`,
            message: issue.message,
          }));
        });
        if (issues.length) throw new HttpError(400, "validation_failed", `${issues[0].path}: ${issues[0].message}`, issues);
        const [set] = await trx("calibration_sets").insert({ program_id: user.programId, name: body.name, created_by: user.id }).returning("id");
        await trx("calibration_items").insert(
          body.exams.map((e, i) => ({ set_id: set.id, exam_id: e.examId, reference: e.reference ? JSON.stringify(e.reference) : null, position: i })),
        );
        const rows = exams.flatMap((e) =>
          reviewers
            .filter((r) => r !== e.sonographer_id)
            .map((r) => ({
              program_id: user.programId,
              exam_id: e.id,
              kind: "calibration",
              state: "open",
              assigned_to: r,
              rubric_id: rubric.id,
              calibration_set_id: set.id,
              priority: 2,
              due_at: trx.fn.now(),
            })),
        );
        await trx("assignments").insert(rows);
        await audit(trx, {
          programId: user.programId,
          actorUserId: user.id,
          action: "calibration.created",
          entityType: "calibration_set",
          entityId: set.id,
          ip: req.ip,
          details: { exams: examIds.length, reviewers: reviewers.length },
        });
        return set.id as string;
      });
      res.status(201).json({ id });
    },
  });

  defineRoute(kit, {
    method: "get",
    path: "/calibration-sets",
    summary: "Calibration sets with their progress",
    tag: "calibration",
    access: ["qa_lead"],
    responses: { 200: { description: "Sets" } },
    handler: async ({ user }) => {
      const rows = await db("calibration_sets as c")
        .where("c.program_id", user.programId)
        .orderBy("c.created_at", "desc")
        .select(
          "c.id",
          "c.name",
          "c.created_at",
          db.raw(`(SELECT count(*)::int FROM calibration_items i WHERE i.set_id = c.id) AS exams`),
          db.raw(`(SELECT count(*)::int FROM assignments a WHERE a.calibration_set_id = c.id) AS reads`),
          db.raw(`(SELECT count(*)::int FROM assignments a WHERE a.calibration_set_id = c.id AND a.state = 'submitted') AS done`),
        );
      return { items: rows.map((r) => ({ id: r.id, name: r.name, createdAt: r.created_at.toISOString(), exams: r.exams, reads: r.reads, done: r.done })) };
    },
  });

  defineRoute(kit, {
    method: "get",
    path: "/calibration-sets/exams/:id",
    summary: "An exam as the new-set form needs it for a reference answer: its application, the criteria calibration reads would use, its findings",
    tag: "calibration",
    access: ["qa_lead"],
    params: idParamsSchema,
    responses: { 200: { description: "The exam's reference form" }, 404: { description: "No submitted exam with this id in the program" } },
    handler: async ({ user, params }) => {
      const exam = await db("exams as e")
        .join("applications as ap", "ap.id", "e.application_id")
        .where({ "e.id": params.id, "e.program_id": user.programId })
        .whereNot("e.status", "draft")
        .first("e.id", "e.code", "e.application_id", "ap.code as app_code", "ap.name as app_name");
      if (!exam) throw notFound("Submitted exam");
      // The same rubric version the set's calibration reads will be made under.
      const rubric = await activeRubricFor(db, user.programId);
      if (!rubric) throw new HttpError(409, "no_rubric", "Publish a rubric first");
      const findings = (await findingsByApplication(db, [exam.application_id])).get(exam.application_id) ?? [];
      return {
        exam: { id: exam.id, code: exam.code, application: { code: exam.app_code, name: exam.app_name } },
        rubric: { id: rubric.id, name: rubric.name, version: rubric.version },
        criteria: criteriaFor(rubric.criteria, exam.app_code),
        findings,
      };
    },
  });

  defineRoute(kit, {
    method: "get",
    path: "/calibration-sets/:id/results",
    summary: "Multi-rater agreement per criterion and each reviewer against the reference",
    tag: "calibration",
    access: ["qa_lead"],
    params: idParamsSchema,
    responses: { 200: { description: "Results" } },
    handler: async ({ user, params }) => {
      const set = await db("calibration_sets").where({ id: params.id, program_id: user.programId }).first();
      if (!set) throw notFound("Calibration set");
      const items: { exam_id: string; reference: ReferenceAnswer | null; code: string; application_id: string; app_code: string; app_name: string }[] =
        await db("calibration_items as i")
          .join("exams as e", "e.id", "i.exam_id")
          .join("applications as ap", "ap.id", "e.application_id")
          .where("i.set_id", set.id)
          .orderBy("i.position")
          .select("i.exam_id", "i.reference", "e.code", "e.application_id", "ap.code as app_code", "ap.name as app_name");
      const reads = await db("reviews as r")
        .join("assignments as a", "a.id", "r.assignment_id")
        .join("users as u", "u.id", "r.reviewer_id")
        .where("a.calibration_set_id", set.id)
        .select("r.exam_id", "r.reviewer_id", "u.name", "r.scores", "r.reads", "r.rubric_id");
      const rubricId = reads[0]?.rubric_id ?? (await db("assignments").where("calibration_set_id", set.id).first("rubric_id"))?.rubric_id;
      const rubric = rubricId ? await getRubric(db, user.programId, rubricId) : undefined;
      const reviewers = [...new Map(reads.map((r) => [r.reviewer_id as string, r.name as string])).entries()]
        .map(([id, name]) => ({ id, name }))
        .sort((a, b) => a.name.localeCompare(b.name));
      const findings = await findingsByApplication(
        db,
        items.map((i) => i.application_id),
      );
      const byCode = new Map(items.map((i) => [i.app_code, findings.get(i.application_id) ?? []]));
      const results = calibrationResults(
        items.map((i) => ({
          examId: i.exam_id,
          code: i.code,
          application: { code: i.app_code, name: i.app_name },
          reference: i.reference ? { scores: i.reference.scores ?? {}, reads: i.reference.reads ?? [] } : null,
        })),
        reads.map((r) => ({ examId: r.exam_id, reviewerId: r.reviewer_id, scores: r.scores ?? {}, reads: r.reads ?? [] })),
        reviewers,
        rubric?.criteria ?? [],
        (app) => byCode.get(app) ?? [],
      );
      return { id: set.id, name: set.name, ...results };
    },
  });
}
