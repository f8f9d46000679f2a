// Follow-ups of clinically significant disagreements, as the QA lead's list shows them.
import { z } from "zod";

export const FOLLOW_UP_STATUSES = ["open", "in_progress", "closed"] as const;
export const followUpStatusSchema = z.enum(FOLLOW_UP_STATUSES);
export type FollowUpStatus = z.infer<typeof followUpStatusSchema>;

/** How a follow-up was closed. */
export const FOLLOW_UP_OUTCOMES = [
  "patient_contacted",
  "no_action_needed",
  "further_imaging_arranged",
  "referred_to_peer_review",
  "harm_identified",
  "unable_to_contact",
] as const;
export const followUpOutcomeSchema = z.enum(FOLLOW_UP_OUTCOMES);
export type FollowUpOutcome = z.infer<typeof followUpOutcomeSchema>;
export const OUTCOME_LABELS: Record<FollowUpOutcome, string> = {
  patient_contacted: "Patient contacted",
  no_action_needed: "No action needed",
  further_imaging_arranged: "Further imaging arranged",
  referred_to_peer_review: "Referred to peer review",
  harm_identified: "Harm identified",
  unable_to_contact: "Unable to contact",
};
/** Outcomes that need a note saying what happened. */
export const OUTCOMES_NEEDING_NOTE: readonly FollowUpOutcome[] = ["referred_to_peer_review", "harm_identified", "unable_to_contact"];

export const followUpUpdateSchema = z
  .object({
    status: followUpStatusSchema,
    note: z.string().max(2000).optional(),
    /** Required to close. */
    outcome: followUpOutcomeSchema.nullable().optional(),
    /** When it was acted on (the call, the booking); defaults to now on closing. */
    actedAt: z.iso.datetime({ offset: true }).nullable().optional(),
    /** Who acted, when not the person recording it. */
    actedBy: z.string().trim().max(120).optional(),
  })
  .superRefine((v, ctx) => {
    if (v.status === "closed" && !v.outcome) ctx.addIssue({ code: "custom", path: ["outcome"], message: "Choose the outcome to close this follow-up" });
    if (v.outcome && OUTCOMES_NEEDING_NOTE.includes(v.outcome) && !(v.note ?? "").trim())
      ctx.addIssue({ code: "custom", path: ["note"], message: `Write a note: "${OUTCOME_LABELS[v.outcome]}" needs one` });
    if (v.actedAt && Date.parse(v.actedAt) > Date.now() + 5 * 60_000)
      ctx.addIssue({ code: "custom", path: ["actedAt"], message: "The action cannot be in the future" });
  });

export const followUpSchema = z.object({
  id: z.uuid(),
  examId: z.uuid(),
  examCode: z.string(),
  /** The exam's application, by name. */
  application: z.string(),
  sonographer: z.string(),
  performedAt: z.string(),
  reason: z.string(),
  status: followUpStatusSchema,
  note: z.string(),
  createdAt: z.string(),
  closedAt: z.string().nullable(),
  /** Who closed it, by name. */
  closedBy: z.string().nullable(),
  /** Flagged while scoring as needing clinical follow-up now. */
  urgent: z.boolean(),
  outcome: followUpOutcomeSchema.nullable(),
  actedAt: z.string().nullable(),
  actedBy: z.string(),
  dueAt: z.string(),
  /** Not closed and past its due time. */
  overdue: z.boolean(),
  /** The clinician gave an encounter reference (opened on request, audited). */
  hasEncounterRef: z.boolean(),
});
export type FollowUp = z.infer<typeof followUpSchema>;

export const followUpListSchema = z.object({ items: z.array(followUpSchema) });
export const followUpUpdatedSchema = z.object({ id: z.uuid(), status: followUpStatusSchema });
export const encounterRefSchema = z.object({ reference: z.string() });
