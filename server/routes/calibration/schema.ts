// Request shapes of the calibration routes: a set's name, its exams (each optionally with the
// QA lead's reference answer) and the reviewers to calibrate.
import { z } from "zod";
import { readSchema, scoreValueSchema } from "../../../shared/schemas/reviews";

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
