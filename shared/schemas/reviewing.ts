// Answers of the reviewing routes: the queue, the scoring workspace, drafts and submitted
// reads, adjudications and the reviewer's side of the sonographer's questions.
import { z } from "zod";
import { FINDING_READS, SETTINGS, TRANSDUCERS } from "../catalogue";
import { criterionSchema } from "../rubric/types";
import { clipSchema, EXAM_STATUSES } from "./exams";
import { readSchema, scoreValueSchema } from "./reviews";
import { applicationGuideSchema } from "./applications";
import { snippetSchema } from "./settings";

export const ASSIGNMENT_KINDS = ["primary", "second", "adjudication", "calibration"] as const;
export const ASSIGNMENT_STATES = ["open", "claimed", "submitted", "cancelled"] as const;
export const RESULT_SOURCES = ["single_read", "double_read_agreed", "adjudicated"] as const;

const applicationRefSchema = z.object({ code: z.string(), name: z.string() });

export const assignmentSchema = z.object({
  id: z.uuid(),
  kind: z.enum(ASSIGNMENT_KINDS),
  state: z.enum(ASSIGNMENT_STATES),
  claimedAt: z.string().nullable(),
  leaseExpiresAt: z.string().nullable(),
  dueAt: z.string(),
});
export type Assignment = z.infer<typeof assignmentSchema>;

export const waitingGroupSchema = z.object({
  application: applicationRefSchema,
  setting: z.enum(SETTINGS),
  count: z.number().int(),
  oldestWaitingSeconds: z.number(),
  /** The oldest has waited past the program's turnaround target. */
  overdue: z.boolean(),
});
export type WaitingGroup = z.infer<typeof waitingGroupSchema>;

export const heldAssignmentSchema = assignmentSchema.extend({
  examCode: z.string(),
  /** The application's name. */
  application: z.string(),
  applicationCode: z.string(),
});
export type HeldAssignment = z.infer<typeof heldAssignmentSchema>;

/** GET /api/queue: what waits (by application and setting) and what I hold. */
export const queueOverviewSchema = z.object({ waiting: z.array(waitingGroupSchema), held: z.array(heldAssignmentSchema) });
export type QueueOverview = z.infer<typeof queueOverviewSchema>;

/** A clip as a reviewer receives it: only ready clips, never the upload's file name. */
export const reviewClipSchema = clipSchema;
export type ReviewClip = z.infer<typeof reviewClipSchema>;

/** The exam as a reviewer sees it: a code, never the sonographer's id or e-mail, nor their reads. */
export const blindedExamSchema = z.object({
  id: z.uuid(),
  code: z.string(),
  application: applicationRefSchema,
  performedAt: z.string(),
  setting: z.enum(SETTINGS),
  transducer: z.enum(TRANSDUCERS),
  preset: z.string(),
  indication: z.string(),
  views: z.array(z.object({ key: z.string(), label: z.string() })),
  findings: z.array(z.object({ key: z.string(), label: z.string(), hint: z.string() })),
  guide: applicationGuideSchema,
  /** Null while the program keeps sonographers blinded (the default). */
  sonographer: z.object({ name: z.string() }).nullable(),
  clips: z.array(reviewClipSchema),
});
export type BlindedExam = z.infer<typeof blindedExamSchema>;

export const workspaceDraftSchema = z.object({
  scores: z.record(z.string(), scoreValueSchema),
  reads: z.array(readSchema),
  feedback: z.string(),
  timeSpentSeconds: z.number().int(),
  limited: z.boolean(),
  savedAt: z.string(),
});
export type ReviewDraft = z.infer<typeof workspaceDraftSchema>;

/** GET /api/assignments/:id and POST /api/queue/next: everything the scoring workspace needs. */
export const workspaceSchema = z.object({
  assignment: assignmentSchema,
  exam: blindedExamSchema,
  /** Only the criteria for this exam's application. */
  rubric: z.object({ id: z.uuid(), name: z.string(), version: z.number().int(), criteria: z.array(criterionSchema) }),
  draft: workspaceDraftSchema.nullable(),
  snippets: z.array(snippetSchema),
});
export type Workspace = z.infer<typeof workspaceSchema>;

/** PUT /api/assignments/:id/draft. */
export const draftSavedSchema = z.object({ savedAt: z.string(), leaseExpiresAt: z.string() });
export type DraftSaved = z.infer<typeof draftSavedSchema>;

/** POST /api/assignments/:id/review: the review and the exam's state after it. */
export const reviewSubmittedSchema = z.object({
  review: z.object({ id: z.uuid(), submittedAt: z.string(), credit: z.boolean() }),
  examState: z.enum(["final", "waiting", "adjudication", "calibration"]),
});
export type ReviewSubmitted = z.infer<typeof reviewSubmittedSchema>;

/** POST /api/assignments/:id/reassign. */
export const reassignedSchema = z.object({ id: z.uuid(), assignedTo: z.uuid() });
export type Reassigned = z.infer<typeof reassignedSchema>;

export const reviewerReadSchema = z.object({
  kind: z.enum(["primary", "second"]),
  reviewer: z.string(),
  reviewerId: z.uuid(),
  scores: z.record(z.string(), scoreValueSchema),
  reads: z.array(readSchema),
  feedback: z.string(),
  /** Marked technically limited by patient factors. */
  limited: z.boolean(),
  submittedAt: z.string(),
});

export const adjudicationSchema = z.object({
  assignmentId: z.uuid(),
  examId: z.uuid(),
  examCode: z.string(),
  setting: z.enum(SETTINGS),
  application: applicationRefSchema,
  /** The application version the exam was recorded under (its findings' labels). */
  applicationId: z.uuid(),
  assignedTo: z.uuid().nullable(),
  rubric: z.object({ id: z.uuid(), version: z.number().int(), criteria: z.array(criterionSchema) }).nullable(),
  reads: z.array(reviewerReadSchema),
  /** Keys of the criteria (and findings) the two reads differ on beyond tolerance. */
  disagreements: z.array(z.string()),
});
export type Adjudication = z.infer<typeof adjudicationSchema>;

/** GET /api/adjudications. */
export const adjudicationListSchema = z.object({ items: z.array(adjudicationSchema) });

/** POST /api/exams/:id/adjudicate. */
export const adjudicatedSchema = z.object({ examId: z.uuid(), credit: z.boolean(), significantDisagreement: z.array(z.string()) });
export type Adjudicated = z.infer<typeof adjudicatedSchema>;

/** One thread in GET /api/reviews/questions. */
export const questionThreadSchema = z.object({
  examId: z.uuid(),
  code: z.string(),
  application: applicationRefSchema,
  lastMessageAt: z.string(),
  /** The last word is the sonographer's: the thread waits for an answer. */
  lastFromSonographer: z.boolean(),
  messages: z.number().int(),
});
export type QuestionThread = z.infer<typeof questionThreadSchema>;
export const questionThreadListSchema = z.object({ items: z.array(questionThreadSchema) });

/** GET /api/reviews/exams/:id: the exam (never its sonographer), my review and the final result. */
export const reviewedExamSchema = z.object({
  exam: z.object({
    id: z.uuid(),
    code: z.string(),
    application: applicationRefSchema,
    performedAt: z.string(),
    setting: z.enum(SETTINGS),
    status: z.enum(EXAM_STATUSES),
  }),
  /** Null for a QA lead who did not read the exam. */
  myReview: z
    .object({
      submittedAt: z.string(),
      feedback: z.string(),
      criteria: z.array(z.object({ key: z.string(), label: z.string(), value: scoreValueSchema.nullable(), levelLabel: z.string().nullable() })),
      reads: z.array(z.object({ key: z.string(), label: z.string(), read: z.enum(FINDING_READS) })),
    })
    .nullable(),
  final: z.object({ credit: z.boolean(), source: z.enum(RESULT_SOURCES), decidedAt: z.string() }).nullable(),
});
export type ReviewedExam = z.infer<typeof reviewedExamSchema>;
