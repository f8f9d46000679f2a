// Scoring decisions: validating a review against its rubric version, deriving credit and
// per-finding outcomes, comparing double reads against tolerances, and settling each exam's
// final result (single read, agreed double read, or adjudication) — explicitly and audited.
import type { Knex } from "knex";
import type { z } from "zod";
import type { Db } from "../db/knex";
import { HttpError, notFound } from "../http/errors";
import type { Role } from "../../shared/roles";
import type { Actor } from "./actor";
import { feedbackReady, urgentFollowUp } from "./notify";
import { assertMayAdjudicate, assertNotOwnExam, assertOwnClaim, type ReadAct } from "../policies/review";
import { examContext } from "../repositories/exams";
import { getRubric } from "../repositories/rubrics";
import { getSettings } from "../repositories/settings";
import type { Rubric, Scores } from "../../shared/rubric/types";
import { creditFor, disagreements, misreadFindings, outcome, scoreIssues, significantDisagreement, type CreditFacts } from "../../shared/rubric/logic";
import type { FindingRead } from "../../shared/catalogue";
import { audit, auditAs } from "../repositories/audit";
import { findAssignment, markSubmitted, openAdjudication, undecidedAdjudication } from "../repositories/assignments";
import { deleteDraft, doubleReadsOf, insertReview, replaceFindingOutcomes, writeFinalResult } from "../repositories/reviews";
import { openFollowUp } from "../repositories/follow-ups";
import { markExamInAdjudication, markExamReviewed } from "../repositories/exams";
import type { adjudicateSchema, ProgramSettings, submitReviewSchema } from "../../shared/schemas/reviews";

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
  findingLabels: { key: string; label: string }[];
  sonographerReads: Read[];
  require_complete: boolean;
  requiredViews: { key: string; label: string }[];
  clipViews: string[];
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

/** What the exam contributes to a read's credit: its misread findings and missing required views, by label. */
export function creditFactsOf(exam: ExamContext, reads: Read[], limited: boolean): CreditFacts {
  const label = new Map(exam.findingLabels.map((f) => [f.key, f.label]));
  const misreads = misreadFindings(exam.sonographerReads, reads).map((k) => label.get(k) ?? k);
  const have = new Set(exam.clipViews);
  const missingViews = exam.require_complete ? exam.requiredViews.filter((v) => !have.has(v.key)).map((v) => v.label) : [];
  return { misreads, missingViews, limited };
}

/**
 * Credit of one read (the reviewer's reads are the reference) and the clinical exam's
 * significant disagreements, which open a patient follow-up.
 */
export function assessRead(rubric: Rubric, exam: ExamContext, scores: Scores, reads: Read[], settings: ProgramSettings, limited = false) {
  const significant = significantDisagreement(exam.setting, exam.sonographerReads, reads);
  const { credit, reasons } = creditFor(rubric.criteria, exam.application_code, scores, creditFactsOf(exam, reads, limited), {
    minQuality: settings.minQualityForCredit,
  });
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
    /** The deciding read marked the study technically limited by patient factors. */
    limited?: boolean;
  },
  settings: ProgramSettings,
) {
  const limited = final.limited ?? false;
  const { credit, reasons, significant } = assessRead(rubric, exam, final.scores, final.reads, settings, limited);
  await writeFinalResult(trx, {
    examId: exam.id,
    programId: exam.program_id,
    rubricId: rubric.id,
    scores: final.scores,
    reads: final.reads,
    source: final.source,
    decidedBy: final.decidedBy,
    credit,
    reasons,
    limited,
    note: final.note ?? "",
    at: final.at,
  });
  const ref = new Map(final.reads.map((r) => [r.key, r.read]));
  await replaceFindingOutcomes(
    trx,
    exam.id,
    exam.sonographerReads
      .filter((r) => ref.has(r.key))
      .map((r) => ({ finding_key: r.key, sonographer_read: r.read, reference_read: ref.get(r.key)!, outcome: outcome(r.read, ref.get(r.key)!) })),
  );
  if (significant.length) {
    await openFollowUp(trx, {
      programId: exam.program_id,
      examId: exam.id,
      reviewId: final.reviewId ?? null,
      dueHours: settings.followUpDueHours,
      reason: `Clinically significant disagreement on a clinical exam: ${significant.map((k) => exam.findingLabels.find((f) => f.key === k)?.label ?? k).join(", ")} (the clinician's read differs from the ${final.source === "adjudicated" ? "adjudicated" : "reviewer's"} read). Consider whether the patient needs a callback.`,
    });
  }
  await markExamReviewed(trx, exam.id);
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
  const reads = await doubleReadsOf(trx, exam.id);
  if (!exam.double_read) {
    const r = reads[0];
    await settleExam(
      trx,
      rubric,
      exam,
      { scores: r.scores, reads: r.reads, source: "single_read", decidedBy: null, reviewId: r.id, at: r.submitted_at, limited: r.limited },
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
        limited: primary.limited,
      },
      settings,
    );
    return "final";
  }
  await openAdjudication(trx, exam, rubric.id);
  await markExamInAdjudication(trx, exam.id);
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
    body: { scores: Scores; reads: Read[]; feedback: string; timeSpentSeconds: number; limited?: boolean; urgent?: { reason: string } | null };
    settings: ProgramSettings;
    ip?: string | null;
    at?: Date;
  },
) {
  const { credit, significant } = assessRead(r.rubric, r.exam, r.body.scores, r.body.reads, r.settings, r.body.limited ?? false);
  const review = await insertReview(trx, {
    programId: r.exam.program_id,
    assignmentId: r.assignment.id,
    examId: r.exam.id,
    reviewerId: r.reviewerId,
    rubricId: r.rubric.id,
    scores: r.body.scores,
    reads: r.body.reads,
    feedback: r.body.feedback,
    timeSpentSeconds: r.body.timeSpentSeconds,
    limited: r.body.limited ?? false,
    credit,
    significantDisagreement: significant.length > 0,
    urgentReason: r.body.urgent?.reason ?? null,
    at: r.at,
  });
  await markSubmitted(trx, r.assignment.id, r.reviewerId, r.at);
  await deleteDraft(trx, r.assignment.id);
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
  return { review, examState };
}

/** What a decision is made on: the exam, the rubric version of its read, the program's settings. */
interface Decision {
  exam: ExamContext & { code: string };
  rubric: Rubric;
  settings: ProgramSettings;
}

/**
 * The one sequence by which a read decides something (a submitted read, an adjudication):
 * load the exam (404), let `gate` check the read still waits for this caller (it names the
 * rubric version), refuse the caller's own exam, load the rubric (409), check the scores were
 * made under that version, validate scores and reads against it (400), load the settings,
 * `write` the decision, and tell the sonographer when the result became final.
 */
async function decide<T>(
  trx: Knex.Transaction,
  appUrl: string,
  actor: Actor,
  s: {
    examId: string;
    act: ReadAct;
    gate: (exam: ExamContext) => { rubricId: string | null; rubricMissing: string };
    body: { rubricId?: string; scores: Scores; reads: Read[] };
    write: (d: Decision) => Promise<{ final: boolean; result: T }>;
  },
): Promise<T> {
  const exam = await examContext(trx, actor.programId, s.examId);
  if (!exam) throw notFound("Exam");
  const { rubricId, rubricMissing } = s.gate(exam);
  assertNotOwnExam(exam, actor.userId, s.act);
  const rubric = rubricId ? await getRubric(trx, actor.programId, rubricId) : undefined;
  if (!rubric) throw new HttpError(409, "no_rubric", rubricMissing);
  if (s.body.rubricId && s.body.rubricId !== rubric.id) {
    throw new HttpError(
      400,
      "validation_failed",
      `rubricId: these scores were made under another rubric version; this exam is scored under version ${rubric.version}`,
      [{ path: "rubricId", message: "Another rubric version" }],
    );
  }
  assertValidReview(rubric, exam, s.body.scores, s.body.reads);
  const settings = await getSettings(trx, actor.programId);
  const { final, result } = await s.write({ exam, rubric, settings });
  if (final) await feedbackReady(trx, appUrl, exam);
  return result;
}

/**
 * A reviewer's "needs clinical follow-up now": an urgent follow-up opens at once (or the open
 * one becomes urgent), due by the program's urgent target, and the QA leads and the on-call
 * address are told now, in the app and by e-mail, whatever second read or adjudication follows.
 */
async function flagUrgent(
  trx: Knex.Transaction,
  appUrl: string,
  actor: Actor,
  f: { exam: ExamContext & { code: string }; reviewId: string; reason: string; settings: ProgramSettings },
) {
  const followUp = await openFollowUp(trx, {
    programId: f.exam.program_id,
    examId: f.exam.id,
    reviewId: f.reviewId,
    reason: `Flagged while scoring as needing clinical follow-up now: ${f.reason}`,
    dueHours: f.settings.urgentFollowUpDueHours,
    urgent: true,
    flaggedBy: actor.userId,
  });
  await auditAs(trx, actor, {
    action: "follow_up.urgent_flagged",
    entityType: "follow_up",
    entityId: followUp.id,
    details: { examId: f.exam.id, reviewId: f.reviewId },
  });
  await urgentFollowUp(trx, appUrl, { exam: f.exam, reason: f.reason, onCall: f.settings.onCallEmail, dueHours: f.settings.urgentFollowUpDueHours });
}

/** A reviewer submits the read they hold: scores, their own read of each finding and feedback. */
export async function submitRead(db: Db, appUrl: string, actor: Actor, assignmentId: string, body: z.output<typeof submitReviewSchema>) {
  return db.transaction(async (trx) => {
    const a = await findAssignment(trx, actor.programId, assignmentId, { lock: true });
    assertOwnClaim(a, actor.userId);
    if (a.kind === "adjudication") throw new HttpError(409, "use_adjudication", "Set the final scores of an adjudication from the adjudication screen");
    return decide(trx, appUrl, actor, {
      examId: a.exam_id,
      act: "review",
      gate: () => ({ rubricId: a.rubric_id, rubricMissing: "The rubric of this assignment is missing" }),
      body,
      write: async ({ exam, rubric, settings }) => {
        const { review, examState } = await recordReview(trx, { reviewerId: actor.userId, assignment: a, exam, rubric, body, settings, ip: actor.ip });
        if (body.urgent && a.kind !== "calibration") {
          await flagUrgent(trx, appUrl, actor, { exam, reviewId: review.id, reason: body.urgent.reason, settings });
        }
        return { final: examState === "final", result: { review, examState } };
      },
    });
  });
}

/** A QA lead (or the reviewer the adjudication was handed to) sets the final scores of an exam in adjudication. */
export async function adjudicate(db: Db, appUrl: string, actor: Actor & { roles: readonly Role[] }, examId: string, body: z.output<typeof adjudicateSchema>) {
  return db.transaction(async (trx) => {
    const a = await undecidedAdjudication(trx, actor.programId, examId);
    return decide(trx, appUrl, actor, {
      examId,
      act: "adjudicate",
      gate: () => {
        if (!a) throw new HttpError(409, "not_in_adjudication", "This exam is not waiting for adjudication");
        assertMayAdjudicate({ id: actor.userId, roles: actor.roles }, a);
        return { rubricId: a.rubric_id, rubricMissing: "The rubric of this exam is missing" };
      },
      body,
      write: async ({ exam, rubric, settings }) => {
        await markSubmitted(trx, a!.id, actor.userId);
        const settled = await settleExam(
          trx,
          rubric,
          exam,
          { scores: body.scores, reads: body.reads, source: "adjudicated", decidedBy: actor.userId, note: body.note, limited: body.limited },
          settings,
        );
        await auditAs(trx, actor, { action: "exam.adjudicated", entityType: "exam", entityId: exam.id, details: { scores: body.scores, note: body.note } });
        return { final: true, result: { examId, credit: settled.credit, significantDisagreement: settled.significant } };
      },
    });
  });
}
