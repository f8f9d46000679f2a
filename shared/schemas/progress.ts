// Learner progress and credentialing (README "Progress and credentialing"): the shapes the
// progress API answers with, shared by the screens, the roster and the credentialing report.
import { z } from "zod";
import { isoDateSchema } from "./common";

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

export interface Confirmation {
  findingKey: string;
  label: string;
  /** The sonographer's own read of the finding. */
  sonographerRead: "positive" | "negative" | "indeterminate";
  method: ConfirmationMethod | null;
  result: "positive" | "negative" | null;
  note: string;
  enteredBy: string | null;
  enteredAt: string | null;
}

/** A proportion with its Wilson 95% interval; value null when n = 0. */
export interface Rate {
  successes: number;
  n: number;
  value: number | null;
  ci95: [number, number];
}

export interface Accuracy {
  tp: number;
  fp: number;
  tn: number;
  fn: number;
  /** Reads left out: indeterminate on either side. */
  indeterminate: number;
  sensitivity: Rate;
  specificity: Rate;
  ppv: Rate;
  npv: Rate;
}

export interface CusumView {
  p0: number;
  p1: number;
  alpha: number;
  beta: number;
  s: number;
  h0: number;
  h1: number;
  /** One point per reviewed exam in the order performed; failure = no credentialing credit. */
  points: { n: number; examId: string; performedAt: string; failed: boolean; value: number }[];
  signal: "competent" | "unacceptable" | "none";
  /** 1-based attempt number at which the first signal came, null while none. */
  signalAtAttempt: number | null;
  signalAtDate: string | null;
}

export interface TrendSeries {
  criterionKey: string;
  label: string;
  /** Per reviewed exam, oldest first: attainment 0–1 (1 = the level the program aims for) and the rolling mean. */
  points: { examId: string; performedAt: string; value: number; rolling: number }[];
}

export interface ApplicationProgress {
  application: { code: string; name: string };
  submitted: number;
  reviewed: number;
  credited: number;
  threshold: number;
  /** Credited exams still needed (0 once met). */
  remaining: number;
  met: boolean;
  /** Share of reviewed exams credited. */
  creditRate: Rate;
  /** Counts of final overall image quality levels (value → exams). */
  qualityDistribution: Record<string, number>;
  cusum: CusumView;
  accuracyVsReviewer: Accuracy;
  accuracyVsConfirmatory: Accuracy & { byMethod: Partial<Record<ConfirmationMethod, number>> };
  trends: TrendSeries[];
  lastActivityAt: string | null;
}

export interface CriterionStanding {
  criterionKey: string;
  label: string;
  /** Mean attainment over the window (0–1). */
  mean: number;
  exams: number;
  /** The criterion's help text and the program's advice snippets for it. */
  advice: string[];
}

export interface Progress {
  sonographer: { id: string; name: string; email: string };
  window: number;
  settings: { threshold: number; minQualityForCredit: number; cusum: { p0: number; p1: number; alpha: number; beta: number } };
  range: { from: string | null; to: string | null };
  total: { submitted: number; reviewed: number; credited: number; applicationsMet: number; applications: number };
  applications: ApplicationProgress[];
  strengths: CriterionStanding[];
  focusAreas: CriterionStanding[];
  unreadFeedback: number;
  unacknowledgedFeedback: number;
  lastActivityAt: string | null;
}

export const ROSTER_FLAGS = ["stalled", "falling_quality", "follow_up_open", "cusum_unacceptable"] as const;
export type RosterFlag = (typeof ROSTER_FLAGS)[number];
export const ROSTER_FLAG_LABELS: Record<RosterFlag, string> = {
  stalled: "No exam for 30 days",
  falling_quality: "Quality trend falling",
  follow_up_open: "Disagreement awaiting follow-up",
  cusum_unacceptable: "Learning curve signals unacceptable",
};

export interface RosterRow {
  id: string;
  name: string;
  email: string;
  lastActivityAt: string | null;
  total: { submitted: number; reviewed: number; credited: number };
  applications: {
    code: string;
    name: string;
    submitted: number;
    credited: number;
    reviewed: number;
    threshold: number;
    met: boolean;
    signal: CusumView["signal"];
  }[];
  flags: RosterFlag[];
}

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
