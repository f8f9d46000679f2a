// Scoring decisions: validating a review against its rubric version, deriving credit and
// per-finding outcomes, comparing double reads against tolerances, and settling each exam's
// final result (single read, agreed double read, or adjudication) — explicitly and audited.
import type { Knex } from "knex";
import { HttpError } from "../http/errors";
import type { Rubric, Scores } from "../../shared/rubric/types";
import { creditFor, disagreements, outcome, scoreIssues, significantDisagreement } from "../../shared/rubric/logic";
import type { FindingRead } from "../../shared/catalogue";
import { audit } from "../repositories/audit";
import type { ProgramSettings } from "../../shared/schemas/reviews";

type Read = { key: string; read: FindingRead };

export interface ExamContext {
  id: string;
  program_id: string;
  sonographer_id: string;
  setting: string;
  code: string;
  application_code: string;
  double_read: boolean;
  findingKeys: string[];
  sonographerReads: Read[];
}

/** 400 with every problem named, or nothing. */
export function assertValidReview(rubric: Rubric, exam: ExamContext, scores: Scores, reads: Read[]) {
  const issues = scoreIssues(rubric.criteria, exam.application_code, scores, rubric.version);
  const known = new Set(exam.findingKeys);
  reads.forEach((r, i) => {
    if (!known.has(r.key)) issues.push({ path: `reads.${i}.key`, message: `"${r.key}" is not a finding of this application` });
  });
  const given = new Set(reads.map((r) => r.key));
  for (const k of exam.findingKeys) if (!given.has(k)) issues.push({ path: "reads", message: `Record your own read of "${k}"` });
  if (new Set(reads.map((r) => r.key)).size !== reads.length) issues.push({ path: "reads", message: "Each finding may be read once" });
  if (issues.length) throw new HttpError(400, "validation_failed", `${issues[0].path}: ${issues[0].message}`, issues);
}

/** Credit and disagreement of one read (the reviewer's reads are the reference). */
export function assessRead(rubric: Rubric, exam: ExamContext, scores: Scores, reads: Read[], settings: ProgramSettings) {
  const significant = significantDisagreement(exam.setting, exam.sonographerReads, reads);
  const { credit, reasons } = creditFor(rubric.criteria, exam.application_code, scores, significant.length > 0, { minQuality: settings.minQualityForCredit });
  return { credit, reasons, significant };
}

/** Writes the exam's final result, outcomes and follow-up, and marks it reviewed. */
export async function settleExam(
  trx: Knex.Transaction,
  rubric: Rubric,
  exam: ExamContext,
  final: {
    scores: Scores;
    reads: Read[];
    source: "single_read" | "double_read_agreed" | "adjudicated";
    decidedBy: string | null;
    note?: string;
    reviewId?: string | null;
    /** When the result became final (the last read's time); now by default. */
    at?: Date;
  },
  settings: ProgramSettings,
) {
  const { credit, significant } = assessRead(rubric, exam, final.scores, final.reads, settings);
  await trx("exam_results")
    .insert({
      exam_id: exam.id,
      program_id: exam.program_id,
      rubric_id: rubric.id,
      scores: JSON.stringify(final.scores),
      reads: JSON.stringify(final.reads),
      source: final.source,
      decided_by: final.decidedBy,
      credit,
      note: final.note ?? "",
      decided_at: final.at ?? trx.fn.now(),
    })
    .onConflict("exam_id")
    .merge();
  const ref = new Map(final.reads.map((r) => [r.key, r.read]));
  await trx("finding_outcomes").where("exam_id", exam.id).delete();
  const rows = exam.sonographerReads
    .filter((r) => ref.has(r.key))
    .map((r) => ({
      exam_id: exam.id,
      finding_key: r.key,
      sonographer_read: r.read,
      reference_read: ref.get(r.key)!,
      outcome: outcome(r.read, ref.get(r.key)!),
    }));
  if (rows.length) await trx("finding_outcomes").insert(rows);
  if (significant.length) {
    await trx("follow_ups").insert({
      program_id: exam.program_id,
      exam_id: exam.id,
      review_id: final.reviewId ?? null,
      reason: `Clinically significant disagreement on a clinical exam: ${significant.join(", ")} (the sonographer's read differs from the ${final.source === "adjudicated" ? "adjudicated" : "reviewer's"} read). Consider whether the patient needs a callback.`,
    });
  }
  await trx("exams").where("id", exam.id).update({ status: "reviewed", updated_at: trx.fn.now() });
  await audit(trx, {
    programId: exam.program_id,
    actorUserId: final.decidedBy,
    action: "exam.result_final",
    entityType: "exam",
    entityId: exam.id,
    details: { source: final.source, credit, significant },
  });
  return { credit, significant };
}

/**
 * After a read is submitted: settle the exam, wait for the other read, or send it to
 * adjudication. Rule when a double read agrees within every tolerance: the primary read
 * stands as the final (documented in the README).
 */
export async function resolveAfterRead(
  trx: Knex.Transaction,
  rubric: Rubric,
  exam: ExamContext,
  settings: ProgramSettings,
): Promise<"final" | "waiting" | "adjudication"> {
  const reads = await trx("reviews as r")
    .join("assignments as a", "a.id", "r.assignment_id")
    .where("r.exam_id", exam.id)
    .whereIn("a.kind", ["primary", "second"])
    .select("r.*", "a.kind");
  if (!exam.double_read) {
    const r = reads[0];
    await settleExam(
      trx,
      rubric,
      exam,
      { scores: r.scores, reads: r.reads, source: "single_read", decidedBy: null, reviewId: r.id, at: r.submitted_at },
      settings,
    );
    return "final";
  }
  if (reads.length < 2) return "waiting";
  const primary = reads.find((r) => r.kind === "primary")!;
  const second = reads.find((r) => r.kind === "second")!;
  // Both reads are compared under the primary's rubric version.
  const diff = disagreements(rubric.criteria, exam.application_code, primary, second);
  if (diff.length === 0) {
    await settleExam(
      trx,
      rubric,
      exam,
      {
        scores: primary.scores,
        reads: primary.reads,
        source: "double_read_agreed",
        decidedBy: null,
        reviewId: primary.id,
        at: new Date(Math.max(primary.submitted_at.getTime(), second.submitted_at.getTime())),
      },
      settings,
    );
    return "final";
  }
  await trx("assignments").insert({
    program_id: exam.program_id,
    exam_id: exam.id,
    kind: "adjudication",
    priority: 0,
    due_at: trx.fn.now(),
    rubric_id: rubric.id,
  });
  await trx("exams").where("id", exam.id).update({ status: "adjudication", updated_at: trx.fn.now() });
  await audit(trx, {
    programId: exam.program_id,
    actorUserId: null,
    action: "exam.sent_to_adjudication",
    entityType: "exam",
    entityId: exam.id,
    details: { disagreements: diff.map((d) => d.key) },
  });
  return "adjudication";
}

/** Stores a submitted read (already validated), closes its assignment and settles what follows. */
export async function recordReview(
  trx: Knex.Transaction,
  r: {
    reviewerId: string;
    assignment: { id: string; kind: string };
    exam: ExamContext;
    rubric: Rubric;
    body: { scores: Scores; reads: Read[]; feedback: string; timeSpentSeconds: number };
    settings: ProgramSettings;
    ip?: string;
    at?: Date;
  },
) {
  const { credit, significant } = assessRead(r.rubric, r.exam, r.body.scores, r.body.reads, r.settings);
  const [review] = await trx("reviews")
    .insert({
      program_id: r.exam.program_id,
      assignment_id: r.assignment.id,
      exam_id: r.exam.id,
      reviewer_id: r.reviewerId,
      rubric_id: r.rubric.id,
      scores: JSON.stringify(r.body.scores),
      reads: JSON.stringify(r.body.reads),
      feedback: r.body.feedback,
      time_spent_seconds: r.body.timeSpentSeconds,
      credit,
      significant_disagreement: significant.length > 0,
      ...(r.at ? { submitted_at: r.at } : {}),
    })
    .returning(["id", "submitted_at", "credit"]);
  await trx("assignments")
    .where("id", r.assignment.id)
    .update({ state: "submitted", reviewer_id: r.reviewerId, submitted_at: r.at ?? trx.fn.now(), lease_expires_at: null });
  await trx("review_drafts").where("assignment_id", r.assignment.id).delete();
  await audit(trx, {
    programId: r.exam.program_id,
    actorUserId: r.reviewerId,
    action: "review.submitted",
    entityType: "review",
    entityId: review.id,
    ip: r.ip,
    details: { examId: r.exam.id, assignment: r.assignment.kind, rubricVersion: r.rubric.version, scores: r.body.scores },
  });
  // A calibration read measures the reviewer; it never decides the exam.
  const examState = r.assignment.kind === "calibration" ? ("calibration" as const) : await resolveAfterRead(trx, r.rubric, r.exam, r.settings);
  return { review: review as { id: string; submitted_at: Date; credit: boolean }, examState };
}
