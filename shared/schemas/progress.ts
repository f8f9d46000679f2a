// Learner progress and credentialing (README "Progress and credentialing"): the shapes the
// progress API answers with, shared by the screens, the roster and the credentialing report.
import { z } from "zod";
import { isoDateSchema } from "./common";
import { FINDING_READS } from "../catalogue";

/** How a finding was later confirmed (or that no confirmatory test was done). */
export const CONFIRMATION_METHODS = ["ct", "formal_echo", "surgery", "follow_up", "none"] as const;
export type ConfirmationMethod = (typeof CONFIRMATION_METHODS)[number];
export const CONFIRMATION_METHOD_LABELS: Record<ConfirmationMethod, string> = {
  ct: "CT",
  formal_echo: "Formal echo",
  surgery: "Surgery",
  follow_up: "Clinical follow-up",
  none: "None",
};
/** What the confirmatory test showed for the finding. "none" method carries no result. */
export const CONFIRMED_RESULTS = ["positive", "negative"] as const;

export const confirmationInputSchema = z
  .object({
    findingKey: z.string().min(1).max(60),
    /** null clears what was entered for the finding. */
    method: z.enum(CONFIRMATION_METHODS, { message: "Choose CT, formal echo, surgery, clinical follow-up or none" }).nullable(),
    result: z.enum(CONFIRMED_RESULTS, { message: "Choose positive or negative" }).nullable().default(null),
    note: z.string().trim().max(1000).default(""),
  })
  .superRefine((c, ctx) => {
    if (c.method === null) {
      if (c.result !== null) ctx.addIssue({ code: "custom", path: ["result"], message: "Nothing entered: leave the result empty" });
      return;
    }
    if (c.method !== "none" && c.result === null) ctx.addIssue({ code: "custom", path: ["result"], message: "Say what the confirmatory test showed" });
    if (c.method === "none" && c.result !== null) ctx.addIssue({ code: "custom", path: ["result"], message: "No confirmatory test: leave the result empty" });
  });
export const confirmationsInputSchema = z.object({
  items: z
    .array(confirmationInputSchema)
    .max(40)
    .refine((xs) => new Set(xs.map((x) => x.findingKey)).size === xs.length, "One entry per finding"),
});
export type ConfirmationsInput = z.input<typeof confirmationsInputSchema>;

export const confirmationSchema = z.object({
  findingKey: z.string(),
  label: z.string(),
  /** The sonographer's own read of the finding. */
  sonographerRead: z.enum(FINDING_READS),
  method: z.enum(CONFIRMATION_METHODS).nullable(),
  result: z.enum(CONFIRMED_RESULTS).nullable(),
  note: z.string(),
  enteredBy: z.string().nullable(),
  enteredAt: z.string().nullable(),
});
export type Confirmation = z.infer<typeof confirmationSchema>;
/** GET and PUT /api/exams/:id/confirmations. */
export const confirmationsSchema = z.object({ items: z.array(confirmationSchema) });
export type Confirmations = z.infer<typeof confirmationsSchema>;

/** A proportion with its Wilson 95% interval; value null when n = 0. */
export const rateSchema = z.object({
  successes: z.number(),
  n: z.number(),
  value: z.number().nullable(),
  ci95: z.tuple([z.number(), z.number()]),
});
export type Rate = z.infer<typeof rateSchema>;

export const accuracySchema = z.object({
  tp: z.number(),
  fp: z.number(),
  tn: z.number(),
  fn: z.number(),
  /** Reads left out: indeterminate on either side. */
  indeterminate: z.number(),
  sensitivity: rateSchema,
  specificity: rateSchema,
  ppv: rateSchema,
  npv: rateSchema,
});
export type Accuracy = z.infer<typeof accuracySchema>;

const cusumOptionsSchema = z.object({ p0: z.number(), p1: z.number(), alpha: z.number(), beta: z.number() });

export const cusumViewSchema = cusumOptionsSchema.extend({
  s: z.number(),
  h0: z.number(),
  h1: z.number(),
  /** One point per reviewed exam in the order performed; failure = no credentialing credit. */
  points: z.array(z.object({ n: z.number(), examId: z.string(), performedAt: z.string(), failed: z.boolean(), value: z.number() })),
  signal: z.enum(["competent", "unacceptable", "none"]),
  /** 1-based attempt number at which the first signal came, null while none. */
  signalAtAttempt: z.number().nullable(),
  signalAtDate: z.string().nullable(),
});
export type CusumView = z.infer<typeof cusumViewSchema>;

export const trendSeriesSchema = z.object({
  criterionKey: z.string(),
  label: z.string(),
  /** Per reviewed exam, oldest first: attainment 0–1 (1 = the level the program aims for) and the rolling mean. */
  points: z.array(z.object({ examId: z.string(), performedAt: z.string(), value: z.number(), rolling: z.number() })),
});
export type TrendSeries = z.infer<typeof trendSeriesSchema>;

export const applicationProgressSchema = z.object({
  application: z.object({ code: z.string(), name: z.string() }),
  submitted: z.number(),
  reviewed: z.number(),
  credited: z.number(),
  creditedBySetting: z.object({ clinical: z.number(), educational: z.number(), simulated: z.number() }),
  /** Credited exams that count toward the threshold (educational and simulated ones up to the cap). */
  counted: z.number(),
  /** Credited exams with a positive finding. */
  positives: z.number(),
  /** Reviewed exams marked technically limited by patient factors (no credit, not failures). */
  limited: z.number(),
  threshold: z.number(),
  /** The application's credit rule as applied (threshold resolved from the program's when the application sets none). */
  creditRule: z.object({ threshold: z.number(), nonClinicalCap: z.number().nullable(), minPositive: z.number(), requireComplete: z.boolean() }),
  /** The rule in words, as reports state it. */
  creditRuleText: z.string(),
  /** Counted exams still needed (0 once enough count). */
  remaining: z.number(),
  met: z.boolean(),
  /** Share of the clinician's finding reads (on reviewed exams) that were indeterminate. */
  indeterminateRate: rateSchema,
  /** Share of reviewed exams credited. */
  creditRate: rateSchema,
  /** Counts of final overall image quality levels (value → exams). */
  qualityDistribution: z.record(z.string(), z.number()),
  cusum: cusumViewSchema,
  accuracyVsReviewer: accuracySchema,
  accuracyVsConfirmatory: accuracySchema.extend({ byMethod: z.partialRecord(z.enum(CONFIRMATION_METHODS), z.number()) }),
  trends: z.array(trendSeriesSchema),
  lastActivityAt: z.string().nullable(),
});
export type ApplicationProgress = z.infer<typeof applicationProgressSchema>;

export const criterionStandingSchema = z.object({
  criterionKey: z.string(),
  label: z.string(),
  /** Mean attainment over the window (0–1). */
  mean: z.number(),
  exams: z.number(),
  /** The criterion's help text and the program's advice snippets for it. */
  advice: z.array(z.string()),
});
export type CriterionStanding = z.infer<typeof criterionStandingSchema>;

/** GET /api/me/progress and GET /api/roster/:id/progress. */
export const progressSchema = z.object({
  sonographer: z.object({ id: z.string(), name: z.string(), email: z.string() }),
  window: z.number(),
  settings: z.object({ threshold: z.number(), minQualityForCredit: z.number(), cusum: cusumOptionsSchema }),
  range: z.object({ from: z.string().nullable(), to: z.string().nullable() }),
  total: z.object({ submitted: z.number(), reviewed: z.number(), credited: z.number(), applicationsMet: z.number(), applications: z.number() }),
  applications: z.array(applicationProgressSchema),
  strengths: z.array(criterionStandingSchema),
  focusAreas: z.array(criterionStandingSchema),
  unreadFeedback: z.number(),
  unacknowledgedFeedback: z.number(),
  lastActivityAt: z.string().nullable(),
});
export type Progress = z.infer<typeof progressSchema>;

export const ROSTER_FLAGS = ["stalled", "falling_quality", "follow_up_open", "cusum_unacceptable"] as const;
export type RosterFlag = (typeof ROSTER_FLAGS)[number];
export const ROSTER_FLAG_LABELS: Record<RosterFlag, string> = {
  stalled: "No exam for 30 days",
  falling_quality: "Quality trend falling",
  follow_up_open: "Disagreement awaiting follow-up",
  cusum_unacceptable: "Learning curve signals unacceptable",
};

export const rosterRowSchema = z.object({
  id: z.string(),
  name: z.string(),
  email: z.string(),
  lastActivityAt: z.string().nullable(),
  total: z.object({ submitted: z.number(), reviewed: z.number(), credited: z.number() }),
  applications: z.array(
    z.object({
      code: z.string(),
      name: z.string(),
      submitted: z.number(),
      credited: z.number(),
      reviewed: z.number(),
      threshold: z.number(),
      met: z.boolean(),
      signal: cusumViewSchema.shape.signal,
    }),
  ),
  flags: z.array(z.enum(ROSTER_FLAGS)),
});
export type RosterRow = z.infer<typeof rosterRowSchema>;
/** GET /api/roster. */
export const rosterSchema = z.object({ items: z.array(rosterRowSchema) });
export type Roster = z.infer<typeof rosterSchema>;

export const progressQuerySchema = z.object({
  from: isoDateSchema.optional(),
  to: isoDateSchema.optional(),
  /** Rolling-mean window (exams). */
  window: z.coerce.number().int().min(2).max(50).default(10),
});

export const credentialingReportQuerySchema = z.object({
  format: z.enum(["pdf", "csv"], { message: "format must be pdf or csv" }),
  userId: z.uuid().optional(),
  from: isoDateSchema.optional(),
  to: isoDateSchema.optional(),
});

/** Shown on every progress screen and printed on every report. */
export const CREDENTIALING_CAUTION =
  "Soundings supports education and quality review. It does not make diagnoses. Local policy and licensed practice govern clinical decisions and the granting of privileges.";
