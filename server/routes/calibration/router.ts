// Calibration sets: the QA lead picks exams (optionally with a reference answer) and sends
// them to all or some reviewers as blinded calibration reads; the results show multi-rater
// agreement per criterion (Fleiss' kappa, Krippendorff's alpha) and each reviewer against
// the reference.
import { z } from "zod";
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../app";
import { HttpError, notFound } from "../../http/errors";
import { idParamsSchema } from "../../../shared/schemas/common";
import { scoreValueSchema, readSchema } from "../../../shared/schemas/reviews";
import { activeRubricFor, getRubric } from "../../repositories/rubrics";
import { audit } from "../../repositories/audit";
import { ratingOf } from "../../services/agreement";
import { fleissKappa, krippendorffAlpha, agreementBand } from "../../../shared/stats/index";
import { criteriaFor } from "../../../shared/rubric/logic";

const createSchema = z.object({
  name: z.string().trim().min(1, "Name the calibration set").max(120),
  exams: z
    .array(
      z.object({
        examId: z.uuid(),
        reference: z.object({ scores: z.record(z.string(), scoreValueSchema), reads: z.array(readSchema).default([]) }).optional(),
      }),
    )
    .min(2, "Pick at least two exams")
    .max(50),
  /** Reviewers to calibrate; all active reviewers when left out. */
  reviewerIds: z.array(z.uuid()).min(2, "Pick at least two reviewers").optional(),
});

export function registerCalibrationRoutes(kit: RouteKit, { db }: RouteContext) {
  defineRoute(kit, {
    method: "post",
    path: "/calibration-sets",
    summary: "Send chosen exams to reviewers as blinded calibration reads",
    tag: "calibration",
    access: ["qa_lead"],
    body: createSchema,
    responses: { 201: { description: "Created" } },
    handler: async ({ req, res, user, body }) => {
      const id = await db.transaction(async (trx) => {
        const examIds = body.exams.map((e) => e.examId);
        const exams = await trx("exams").where("program_id", user.programId).whereIn("id", examIds).whereNot("status", "draft").select("id", "sonographer_id");
        const missing = examIds.findIndex((x) => !exams.some((e) => e.id === x));
        if (missing >= 0) throw new HttpError(400, "validation_failed", `exams.${missing}.examId: no submitted exam with this id in the program`);
        const reviewerRows = trx("memberships").where("program_id", user.programId).whereNull("deactivated_at").whereRaw(`'reviewer' = ANY(roles)`);
        if (body.reviewerIds) reviewerRows.whereIn("user_id", body.reviewerIds);
        const reviewers: string[] = await reviewerRows.pluck("user_id");
        if (body.reviewerIds && reviewers.length !== new Set(body.reviewerIds).size)
          throw new HttpError(400, "validation_failed", "reviewerIds: every id must be an active reviewer of this program");
        if (reviewers.length < 2) throw new HttpError(400, "validation_failed", "reviewerIds: calibration needs at least two reviewers");
        const rubric = await activeRubricFor(trx, user.programId);
        if (!rubric) throw new HttpError(409, "no_rubric", "Publish a rubric first");
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
    path: "/calibration-sets/:id/results",
    summary: "Multi-rater agreement per criterion and each reviewer against the reference",
    tag: "calibration",
    access: ["qa_lead"],
    params: idParamsSchema,
    responses: { 200: { description: "Results" } },
    handler: async ({ user, params }) => {
      const set = await db("calibration_sets").where({ id: params.id, program_id: user.programId }).first();
      if (!set) throw notFound("Calibration set");
      const items = await db("calibration_items as i")
        .join("exams as e", "e.id", "i.exam_id")
        .join("applications as ap", "ap.id", "e.application_id")
        .where("i.set_id", set.id)
        .orderBy("i.position")
        .select("i.exam_id", "i.reference", "e.code", "ap.code as app_code");
      const reads = await db("reviews as r")
        .join("assignments as a", "a.id", "r.assignment_id")
        .join("users as u", "u.id", "r.reviewer_id")
        .where("a.calibration_set_id", set.id)
        .select("r.exam_id", "r.reviewer_id", "u.name", "r.scores", "r.reads", "r.rubric_id");
      const rubricId = reads[0]?.rubric_id ?? (await db("assignments").where("calibration_set_id", set.id).first("rubric_id"))?.rubric_id;
      const rubric = rubricId ? await getRubric(db, user.programId, rubricId) : undefined;
      const reviewers = [...new Map(reads.map((r) => [r.reviewer_id, r.name])).entries()]
        .map(([id, name]) => ({ id, name }))
        .sort((a, b) => a.name.localeCompare(b.name));
      const criteria = rubric ? criteriaFor(rubric.criteria, items[0]?.app_code ?? "") : [];
      const perCriterion = criteria.map((c) => {
        const rate = ratingOf(c);
        // One row per exam, one column per reviewer; a missing read is null.
        const matrix = items.map((it) =>
          reviewers.map(
            (rv) => rate(reads.find((r) => r.exam_id === it.exam_id && r.reviewer_id === rv.id)?.scores?.[c.key] ?? null) as string | number | null,
          ),
        );
        const categories = c.kind === "ordinal" ? c.levels.map((_, i) => i) : c.levels.map((l) => l.value);
        // Only exams every reviewer has read; with fewer than two readers there is nothing to compare.
        const completeRows = reviewers.length < 2 ? [] : matrix.filter((row) => row.every((v) => v !== null));
        const fleiss = completeRows.length && c.kind !== "number" ? fleissKappa(completeRows, { categories }) : null;
        const alpha = krippendorffAlpha(matrix, { level: c.kind === "ordinal" ? "ordinal" : c.kind === "number" ? "interval" : "nominal" });
        return {
          key: c.key,
          label: c.label,
          units: completeRows.length,
          fleiss: fleiss ? { value: fleiss.value, ci95: fleiss.ci95 } : null,
          alpha: { value: alpha.value },
          band: fleiss?.value == null ? null : agreementBand(fleiss.value),
        };
      });
      // Each reviewer against the reference answer: the share of reference scores matched exactly.
      const withReference = items.filter((it) => it.reference);
      const vsReference = reviewers.map((rv) => {
        let compared = 0;
        let matched = 0;
        for (const it of withReference) {
          const mine = reads.find((r) => r.exam_id === it.exam_id && r.reviewer_id === rv.id);
          if (!mine) continue;
          for (const [key, value] of Object.entries(it.reference.scores as Record<string, unknown>)) {
            if (mine.scores[key] === undefined) continue;
            compared++;
            if (String(mine.scores[key]) === String(value)) matched++;
          }
        }
        return { reviewer: rv, compared, matched, share: compared ? matched / compared : null };
      });
      return {
        id: set.id,
        name: set.name,
        exams: items.map((i) => ({ id: i.exam_id, code: i.code, hasReference: Boolean(i.reference) })),
        reviewers,
        criteria: perCriterion,
        vsReference,
      };
    },
  });
}
