// Calibration sets: the request that creates one (a name, its exams, each optionally with the
// QA lead's reference answer, and the reviewers to calibrate) and the answers the client
// reads: the list with progress, an exam's reference form, and a set's results.
import { z } from "zod";
import { criterionSchema } from "../rubric/types";
import { readSchema, scoreValueSchema } from "./reviews";

/** The QA lead's own answer for one exam: scores by criterion key and reads of findings; either may be partial. */
export const referenceSchema = z.object({
  scores: z.record(z.string().max(40), scoreValueSchema).default({}),
  reads: z.array(readSchema).max(50).default([]),
});
export type ReferenceAnswer = z.output<typeof referenceSchema>;

export const createCalibrationSetSchema = z.object({
  name: z.string().trim().min(1, "Name the calibration set").max(120),
  exams: z
    .array(z.object({ examId: z.uuid(), reference: referenceSchema.optional() }))
    .min(2, "Pick at least two exams")
    .max(50)
    .refine((exams) => new Set(exams.map((e) => e.examId)).size === exams.length, "Pick each exam once"),
  /** Reviewers to calibrate; all active reviewers when left out. */
  reviewerIds: z.array(z.uuid()).min(2, "Pick at least two reviewers").optional(),
});
/** A new set as the client sends it (reference answers complete in shape: both parts present). */
export type NewCalibrationSet = z.output<typeof createCalibrationSetSchema>;

export const calibrationSetCreatedSchema = z.object({ id: z.uuid() });

export const calibrationSetSummarySchema = z.object({
  id: z.uuid(),
  name: z.string(),
  createdAt: z.string(),
  /** Exams in the set. */
  exams: z.number().int(),
  /** Calibration reads sent out (exams × reviewers, less a sonographer's own exams). */
  reads: z.number().int(),
  /** Reads submitted so far. */
  done: z.number().int(),
});
export type CalibrationSetSummary = z.infer<typeof calibrationSetSummarySchema>;
export const calibrationSetListSchema = z.object({ items: z.array(calibrationSetSummarySchema) });

const applicationRefSchema = z.object({ code: z.string(), name: z.string() });
const findingRefSchema = z.object({ key: z.string(), label: z.string() });

/** What the new-set form needs to take a reference answer for one exam. */
export const referenceFormSchema = z.object({
  exam: z.object({ id: z.uuid(), code: z.string(), application: applicationRefSchema }),
  rubric: z.object({ id: z.uuid(), name: z.string(), version: z.number().int() }),
  /** The rubric's criteria for the exam's application, in display order. */
  criteria: z.array(criterionSchema),
  findings: z.array(findingRefSchema),
});
export type ReferenceForm = z.infer<typeof referenceFormSchema>;

const wireScoreSchema = z.union([z.string(), z.number()]);
const intervalSchema = z.tuple([z.number(), z.number()]);

export const personSchema = z.object({ id: z.uuid(), name: z.string() });
export type Person = z.infer<typeof personSchema>;

export const calibrationCriterionSchema = z.object({
  key: z.string(),
  label: z.string(),
  /** Exams every reviewer has read for this criterion. */
  units: z.number().int(),
  fleiss: z.object({ value: z.number().nullable(), ci95: intervalSchema.nullable() }).nullable(),
  alpha: z.object({ value: z.number().nullable() }),
  band: z.string().nullable(),
});
export type CalibrationCriterion = z.infer<typeof calibrationCriterionSchema>;

export const matchCountSchema = z.object({ compared: z.number().int(), matched: z.number().int(), share: z.number().nullable() });
export type MatchCount = z.infer<typeof matchCountSchema>;

/** One reviewer against the reference answers: scores (top level) and reads of findings. */
export const reviewerVsReferenceSchema = matchCountSchema.extend({ reviewer: personSchema, reads: matchCountSchema });
export type ReviewerVsReference = z.infer<typeof reviewerVsReferenceSchema>;

/** One value of a reference answer beside each reviewer's (null while a reviewer has not read the exam). */
export const referenceRowSchema = z.object({
  kind: z.enum(["score", "read"]),
  key: z.string(),
  label: z.string(),
  reference: z.object({ value: wireScoreSchema, label: z.string() }),
  given: z.array(z.object({ reviewerId: z.uuid(), value: wireScoreSchema.nullable(), label: z.string().nullable(), matches: z.boolean().nullable() })),
});
export type ReferenceRow = z.infer<typeof referenceRowSchema>;

export const calibrationResultsSchema = z.object({
  id: z.uuid(),
  name: z.string(),
  exams: z.array(z.object({ id: z.uuid(), code: z.string(), application: applicationRefSchema, hasReference: z.boolean() })),
  reviewers: z.array(personSchema),
  criteria: z.array(calibrationCriterionSchema),
  vsReference: z.array(reviewerVsReferenceSchema),
  referenceDetail: z.array(z.object({ examId: z.uuid(), code: z.string(), rows: z.array(referenceRowSchema) })),
});
export type CalibrationResults = z.infer<typeof calibrationResultsSchema>;
