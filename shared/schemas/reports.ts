// The QA lead's reports as the API sends them: reviewer agreement (GET /api/reports/agreement)
// and the program's backlog, turnaround, volume and workload (GET /api/reports/program).
// The credentialing report is a file (PDF or CSV), see ./progress.
import { z } from "zod";
import { isoDateSchema } from "./common";

const intervalSchema = z.tuple([z.number(), z.number()]);
export type Interval = z.infer<typeof intervalSchema>;

const dateRange = { from: isoDateSchema.optional(), to: isoDateSchema.optional() };

export const agreementReportQuerySchema = z.object({
  ...dateRange,
  application: z.string().max(40).optional(),
  criterion: z.string().max(40).optional(),
  reviewerA: z.uuid().optional(),
  reviewerB: z.uuid().optional(),
});
export const programReportQuerySchema = z.object(dateRange);

export const criterionAgreementSchema = z.object({
  key: z.string(),
  label: z.string(),
  kind: z.string(),
  /** Exams read twice with both values present. */
  units: z.number(),
  percentAgreement: z.number().nullable(),
  kappa: z.object({ value: z.number().nullable(), ci95: intervalSchema.nullable(), weights: z.enum(["quadratic", "unweighted"]) }),
  alpha: z.object({
    value: z.number().nullable(),
    level: z.enum(["ordinal", "nominal", "interval"]),
    /** Percentile bootstrap over exams; null when alpha or the interval is not computable. */
    ci95: intervalSchema.nullable(),
    /** Resamples drawn, seed, and resamples with a defined alpha. */
    bootstrap: z.object({ samples: z.number(), seed: z.number(), used: z.number() }).nullable(),
  }),
  ac1: z.object({ value: z.number().nullable(), ci95: intervalSchema.nullable() }),
  band: z.string().nullable(),
});
export type CriterionAgreement = z.infer<typeof criterionAgreementSchema>;

const personSchema = z.object({ id: z.string(), name: z.string() });
export type Person = z.infer<typeof personSchema>;

export const pairAgreementSchema = z.object({
  a: personSchema,
  b: personSchema,
  units: z.number(),
  percentAgreement: z.number().nullable(),
  kappa: z.number().nullable(),
});
export type PairAgreement = z.infer<typeof pairAgreementSchema>;

export const confusionSchema = z.object({
  rowLabel: z.string(),
  colLabel: z.string(),
  categories: z.array(z.object({ value: z.string(), label: z.string() })),
  counts: z.array(z.array(z.number())),
});
export type Confusion = z.infer<typeof confusionSchema>;

export const reviewerBiasSchema = z.object({
  reviewer: personSchema,
  n: z.number(),
  meanDifference: z.number().nullable(),
  ci95: intervalSchema.nullable(),
});
export type ReviewerBias = z.infer<typeof reviewerBiasSchema>;

export const disagreementSchema = z.object({
  examId: z.string(),
  code: z.string(),
  application: z.string(),
  a: z.string().nullable(),
  b: z.string().nullable(),
});
export type Disagreement = z.infer<typeof disagreementSchema>;

export const agreementReportSchema = z.object({
  from: z.string().nullable(),
  to: z.string().nullable(),
  application: z.string().nullable(),
  criterion: z.string(),
  criteria: z.array(criterionAgreementSchema),
  pairs: z.array(pairAgreementSchema),
  confusion: confusionSchema,
  bias: z.array(reviewerBiasSchema),
  disagreements: z.array(disagreementSchema),
});
export type AgreementReport = z.infer<typeof agreementReportSchema>;

export const BACKLOG_BUCKETS = ["under 1 day", "1–3 days", "3–7 days", "over 7 days"] as const;
export type BacklogBucket = (typeof BACKLOG_BUCKETS)[number];

export const reviewerWorkloadSchema = z.object({
  id: z.string(),
  name: z.string(),
  reviews: z.number(),
  medianSeconds: z.number().nullable(),
  held: z.number(),
});
export type ReviewerWorkload = z.infer<typeof reviewerWorkloadSchema>;

export const programReportSchema = z.object({
  from: z.string(),
  to: z.string(),
  backlog: z.array(z.object({ bucket: z.enum(BACKLOG_BUCKETS), count: z.number() })),
  weekly: z.array(
    z.object({
      week: z.string(),
      submitted: z.number(),
      reviewed: z.number(),
      turnaroundMedianHours: z.number().nullable(),
      turnaroundP90Hours: z.number().nullable(),
    }),
  ),
  volume: z.array(z.object({ week: z.string(), application: z.string(), count: z.number() })),
  reviewers: z.array(reviewerWorkloadSchema),
  /** Follow-ups closed in the range by outcome ("unrecorded" for those closed before outcomes existed), time to closure, and those open now. */
  followUps: z.object({
    byOutcome: z.array(z.object({ outcome: z.string(), count: z.number() })),
    medianHoursToClose: z.number().nullable(),
    p90HoursToClose: z.number().nullable(),
    closedLate: z.number(),
    urgentClosed: z.number(),
    open: z.number(),
    openOverdue: z.number(),
    openUrgent: z.number(),
  }),
});
export type ProgramReport = z.infer<typeof programReportSchema>;
