// Calibration sets: the QA lead picks exams (optionally with a reference answer) and sends
// them to all or some reviewers as blinded calibration reads; the results show multi-rater
// agreement per criterion (Fleiss' kappa, Krippendorff's alpha) and each reviewer against
// the reference.
import type { z } from "zod";
import type { Db } from "../db/knex";
import { HttpError, notFound } from "../http/errors";
import { criteriaFor } from "../../shared/rubric/logic";
import type { createCalibrationSetSchema, ReferenceForm } from "../../shared/schemas/calibration";
import { activeRubricFor, getRubric } from "../repositories/rubrics";
import {
  activeReviewerIds,
  calibrationItems,
  calibrationReads,
  calibrationRubricId,
  findCalibrationSet,
  findingsByApplication,
  insertCalibrationSet,
  listCalibrationSets,
  submittedExams,
  submittedExamWithApplication,
} from "../repositories/calibration";
import { auditAs } from "../repositories/audit";
import { assertCalibrationReviewers } from "../policies/calibration";
import { referenceIssues } from "./calibration-reference";
import { calibrationResults } from "./calibration-results";
import type { Actor } from "./actor";

export const calibrationSets = (db: Db, programId: string) => listCalibrationSets(db, programId);

/**
 * Creates a set: its exams must be submitted exams of the program, its reviewers active
 * reviewers (at least two), every reference answer one a reviewer could give under the
 * published rubric; then each reviewer gets a calibration read of every exam not their own.
 */
export function createCalibrationSet(db: Db, actor: Actor, body: z.output<typeof createCalibrationSetSchema>): Promise<string> {
  return db.transaction(async (trx) => {
    const examIds = body.exams.map((e) => e.examId);
    const exams = await submittedExams(trx, actor.programId, examIds);
    const missing = examIds.findIndex((x) => !exams.some((e) => e.id === x));
    if (missing >= 0) {
      const message = "No submitted exam with this id in the program";
      throw new HttpError(400, "validation_failed", `exams.${missing}.examId: ${message}`, [{ path: `exams.${missing}.examId`, message }]);
    }
    const reviewers = await activeReviewerIds(trx, actor.programId, body.reviewerIds);
    assertCalibrationReviewers(body.reviewerIds, reviewers);
    const rubric = await activeRubricFor(trx, actor.programId);
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
    const id = await insertCalibrationSet(trx, {
      programId: actor.programId,
      name: body.name,
      createdBy: actor.userId,
      rubricId: rubric.id,
      items: body.exams,
      reads: exams.flatMap((e) => reviewers.filter((r) => r !== e.sonographer_id).map((r) => ({ examId: e.id, reviewerId: r }))),
    });
    await auditAs(trx, actor, {
      action: "calibration.created",
      entityType: "calibration_set",
      entityId: id,
      details: { exams: examIds.length, reviewers: reviewers.length },
    });
    return id;
  });
}

/** An exam as the new-set form needs it for a reference answer: the criteria calibration reads would use and its findings. */
export async function referenceForm(db: Db, programId: string, examId: string): Promise<ReferenceForm> {
  const exam = await submittedExamWithApplication(db, programId, examId);
  if (!exam) throw notFound("Submitted exam");
  // The same rubric version the set's calibration reads will be made under.
  const rubric = await activeRubricFor(db, programId);
  if (!rubric) throw new HttpError(409, "no_rubric", "Publish a rubric first");
  const findings = (await findingsByApplication(db, [exam.application_id])).get(exam.application_id) ?? [];
  return {
    exam: { id: exam.id, code: exam.code, application: { code: exam.app_code, name: exam.app_name } },
    rubric: { id: rubric.id, name: rubric.name, version: rubric.version },
    criteria: criteriaFor(rubric.criteria, exam.app_code),
    findings,
  };
}

/** A set's results: agreement per criterion among its reviewers and each reviewer against the reference answers. */
export async function calibrationSetResults(db: Db, programId: string, setId: string) {
  const set = await findCalibrationSet(db, programId, setId);
  if (!set) throw notFound("Calibration set");
  const items = await calibrationItems(db, set.id);
  const reads = await calibrationReads(db, set.id);
  const rubricId = reads[0]?.rubric_id ?? (await calibrationRubricId(db, set.id));
  const rubric = rubricId ? await getRubric(db, programId, rubricId) : undefined;
  const reviewers = [...new Map(reads.map((r) => [r.reviewer_id, r.name])).entries()]
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
}
