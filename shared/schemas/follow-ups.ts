// Follow-ups of clinically significant disagreements, as the QA lead's list shows them.
import { z } from "zod";

export const FOLLOW_UP_STATUSES = ["open", "in_progress", "closed"] as const;
export const followUpStatusSchema = z.enum(FOLLOW_UP_STATUSES);
export type FollowUpStatus = z.infer<typeof followUpStatusSchema>;

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
});
export type FollowUp = z.infer<typeof followUpSchema>;

export const followUpListSchema = z.object({ items: z.array(followUpSchema) });
export const followUpUpdatedSchema = z.object({ id: z.uuid(), status: followUpStatusSchema });
