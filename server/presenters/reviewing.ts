// What the reviewing routes send: the queue overview, the scoring workspace, the adjudication
// list and the reviewer's page of an exam, each as its shared schema (shared/schemas/reviews.ts).
import { criteriaFor } from "../../shared/rubric/logic";
import type {
  Adjudication,
  BlindedExam,
  DraftSaved,
  QueueOverview,
  QuestionThread,
  ReviewedExam as ReviewedExamWire,
  ReviewSubmitted,
  Workspace as WorkspaceWire,
} from "../../shared/schemas/reviewing";
import type { queueOverview, Workspace } from "../services/queue";
import type { OpenAdjudication } from "../services/adjudications";
import type { ReviewedExam } from "../services/reviewed-exams";
import { presentAssignment, presentBlindedExam, presentRubricFor, type AssignmentRow } from "./assignment";

export function presentQueueOverview(o: Awaited<ReturnType<typeof queueOverview>>): QueueOverview {
  return {
    waiting: o.waiting.map((w) => ({
      application: { code: w.code, name: w.name },
      setting: w.setting as QueueOverview["waiting"][number]["setting"],
      count: w.count,
      oldestWaitingSeconds: w.oldest_seconds,
      // Clinical exams have their own, shorter target: a patient may be waiting on the answer.
      overdue: w.oldest_seconds > (w.setting === "clinical" ? o.clinicalTurnaroundHours : o.turnaroundHours) * 3600,
    })),
    held: o.held.map((h) => ({
      ...(presentAssignment(h as AssignmentRow) as QueueOverview["held"][number]),
      examCode: h.code,
      application: h.application,
      applicationCode: h.application_code,
    })),
  };
}

export function presentWorkspace(w: Workspace): WorkspaceWire {
  const exam = w.detail.exam as unknown as Parameters<typeof presentBlindedExam>[0]["exam"];
  return {
    assignment: presentAssignment(w.assignment) as WorkspaceWire["assignment"],
    exam: presentBlindedExam({ exam, clips: w.detail.clips, views: w.views, findings: w.findings, blindSonographer: w.blindSonographer }) as BlindedExam,
    rubric: presentRubricFor(w.rubric, w.detail.exam.app_code),
    draft: w.draft ? { ...w.draft, savedAt: w.draft.savedAt.toISOString() } : null,
    snippets: w.snippets,
  };
}

export const presentDraftSaved = (d: { savedAt: Date; leaseExpiresAt: Date }): DraftSaved => ({
  savedAt: d.savedAt.toISOString(),
  leaseExpiresAt: d.leaseExpiresAt.toISOString(),
});

export const presentReviewSubmitted = (r: {
  review: { id: string; submitted_at: Date; credit: boolean };
  examState: ReviewSubmitted["examState"];
}): ReviewSubmitted => ({
  review: { id: r.review.id, submittedAt: r.review.submitted_at.toISOString(), credit: r.review.credit },
  examState: r.examState,
});

export function presentAdjudication(r: OpenAdjudication): Adjudication {
  return {
    assignmentId: r.assignment_id,
    examId: r.exam_id,
    examCode: r.code,
    setting: r.setting as Adjudication["setting"],
    application: { code: r.app_code, name: r.app_name },
    applicationId: r.application_id,
    assignedTo: r.assigned_to,
    rubric: r.rubric ? { id: r.rubric.id, version: r.rubric.version, criteria: r.rubric.criteria } : null,
    reads: r.reads.map((x) => ({
      kind: x.kind,
      reviewer: x.reviewer,
      reviewerId: x.reviewer_id,
      scores: x.scores,
      reads: x.reads,
      feedback: x.feedback,
      limited: x.limited,
      submittedAt: x.submitted_at.toISOString(),
    })),
    disagreements: r.disagreements,
  };
}

export const presentQuestionThread = (r: {
  id: string;
  code: string;
  app_code: string;
  app_name: string;
  n: string | number;
  last_at: Date | string;
  last_from_sonographer: boolean | null;
}): QuestionThread => ({
  examId: r.id,
  code: r.code,
  application: { code: r.app_code, name: r.app_name },
  lastMessageAt: new Date(r.last_at).toISOString(),
  lastFromSonographer: r.last_from_sonographer === true,
  messages: Number(r.n),
});

export function presentReviewedExam({ exam, review, rubric, findings, result }: ReviewedExam): ReviewedExamWire {
  let myReview: ReviewedExamWire["myReview"] = null;
  if (review) {
    const scores = (review.scores ?? {}) as Record<string, string | number>;
    const criteria = rubric
      ? criteriaFor(rubric.criteria, exam.app_code).map((c) => {
          const value = scores[c.key] ?? null;
          const level = value === null ? undefined : c.levels.find((l) => l.value === String(value));
          return { key: c.key, label: c.label, value, levelLabel: level?.label ?? null };
        })
      : [];
    const labels = new Map(findings.map((f) => [f.key, f.label]));
    const position = new Map(findings.map((f, i) => [f.key, i]));
    const reads = (review.reads ?? [])
      .map((r) => ({ key: r.key, label: labels.get(r.key) ?? r.key, read: r.read }))
      .sort((a, b) => (position.get(a.key) ?? 999) - (position.get(b.key) ?? 999));
    myReview = { submittedAt: review.submitted_at.toISOString(), feedback: review.feedback, criteria, reads };
  }
  return {
    exam: {
      id: exam.id,
      code: exam.code,
      application: { code: exam.app_code, name: exam.app_name },
      performedAt: exam.performed_at.toISOString(),
      setting: exam.setting as ReviewedExamWire["exam"]["setting"],
      status: exam.status as ReviewedExamWire["exam"]["status"],
    },
    myReview,
    final: result ? { credit: result.credit, source: result.source, decidedAt: result.decided_at.toISOString() } : null,
  };
}
