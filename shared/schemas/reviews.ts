// The review queue, scoring, adjudication, feedback and program settings.
import { z } from "zod";
import { FINDING_READS } from "../catalogue";
import { emailSchema } from "./auth";

export const scoreValueSchema = z.union([z.string().min(1).max(40), z.number()]);

export const readSchema = z.object({ key: z.string().min(1).max(60), read: z.enum(FINDING_READS) });

/** A reviewer's flag that the patient may need clinical follow-up now, with the reason. */
export const urgentFlagSchema = z.object({
  reason: z.string().trim().min(1, "Say why this patient needs follow-up now").max(1000, "Keep the reason under 1000 characters"),
});

export const submitReviewSchema = z.object({
  /** The rubric version the scores were made under; must be the assignment's. */
  rubricId: z.uuid().optional(),
  scores: z.record(z.string().max(40), scoreValueSchema),
  reads: z.array(readSchema).max(50).default([]),
  feedback: z.string().max(5000).default(""),
  timeSpentSeconds: z
    .number()
    .int()
    .min(0)
    .max(24 * 3600)
    .default(0),
  /** The study is technically limited by patient factors (habitus, air, a patient who cannot move): no credit, and not a failure of technique. */
  limited: z.boolean().default(false),
  /** "Needs clinical follow-up now": the QA lead and the on-call address are told at once, before any second read or adjudication. */
  urgent: urgentFlagSchema.nullable().default(null),
});

export const reviewDraftSchema = z.object({
  limited: z.boolean().default(false),
  scores: z.record(z.string().max(40), scoreValueSchema).default({}),
  reads: z.array(readSchema).max(50).default([]),
  feedback: z.string().max(5000).default(""),
  timeSpentSeconds: z
    .number()
    .int()
    .min(0)
    .max(24 * 3600)
    .default(0),
});

export const queueNextSchema = z.object({ application: z.string().max(40).optional() });

export const reassignSchema = z.object({ reviewerId: z.uuid() });

export const adjudicateSchema = z.object({
  scores: z.record(z.string().max(40), scoreValueSchema),
  reads: z.array(readSchema).max(50).default([]),
  note: z.string().max(2000).default(""),
  limited: z.boolean().default(false),
});

export const snippetInputSchema = z.object({
  criterionKey: z.string().max(40).nullable().default(null),
  text: z.string().trim().min(1, "Write the snippet").max(1000),
});

export const messageInputSchema = z.object({ body: z.string().trim().min(1, "Write your question").max(4000) });

export const programSettingsSchema = z.object({
  /** Share of exams sampled for an independent second read. */
  doubleReadShare: z.number().min(0).max(1).default(0.2),
  /** Reviewers see an exam code, never the sonographer. */
  blindSonographer: z.boolean().default(true),
  /** Sonographers see the reviewer's name on their feedback. */
  showReviewerName: z.boolean().default(true),
  /** Clinical exams waiting longer than this are overdue (queue, reviewer digest): a patient may be waiting. */
  clinicalTurnaroundHours: z
    .number()
    .int()
    .min(1)
    .max(24 * 60)
    .default(24),
  /** An address told at once of an urgent flag, besides the QA leads (for example the department's on-call inbox); empty for none. */
  onCallEmail: z.union([emailSchema, z.literal("")]).default(""),
  /** A follow-up is overdue this long after it opened. */
  followUpDueHours: z
    .number()
    .int()
    .min(1)
    .max(24 * 60)
    .default(72),
  /** An urgent follow-up (flagged while scoring) is overdue this long after it opened. */
  urgentFollowUpDueHours: z
    .number()
    .int()
    .min(1)
    .max(24 * 60)
    .default(24),
  /** Educational and simulated work waiting longer than this is overdue (reviewer digest). */
  turnaroundHours: z
    .number()
    .int()
    .min(1)
    .max(24 * 60)
    .default(72),
  /** How long a claim lasts before the exam returns to the queue. */
  leaseMinutes: z
    .number()
    .int()
    .min(1)
    .max(24 * 60)
    .default(30),
  minQualityForCredit: z.number().int().min(1).max(5).default(3),
  /** Credited exams needed per application (demo default 25). */
  credentialingThreshold: z.number().int().min(1).max(1000).default(25),
  // Learning-curve CUSUM (shared/stats/cusum.ts). A failure is a reviewed exam without
  // credentialing credit. Defaults: acceptable failure rate 10%, unacceptable 20%, alpha =
  // beta = 0.10, the values most often chosen in published procedural learning-curve
  // CUSUMs after Bolsin & Colson (2000, Int J Qual Health Care 12:433) — common practice,
  // quoted from memory; a program should set its own.
  /** Acceptable failure rate p0 (H0). */
  cusumAcceptableRate: z.number().gt(0).lt(1).default(0.1),
  /** Unacceptable failure rate p1 (H1), above p0. */
  cusumUnacceptableRate: z.number().gt(0).lt(1).default(0.2),
  /** Type I error: chance of signalling "unacceptable" for a learner at p0. */
  cusumAlpha: z.number().gt(0).lt(0.5).default(0.1),
  /** Type II error: chance of signalling "competent" for a learner at p1. */
  cusumBeta: z.number().gt(0).lt(0.5).default(0.1),
});
export type ProgramSettings = z.infer<typeof programSettingsSchema>;
export const programSettingsUpdateSchema = programSettingsSchema.partial();
