// One reviewed exam's feedback as the API sends it: to its sonographer (GET /api/me/feedback)
// and, with the reviewers always named, to a QA lead (GET /api/roster/:id/feedback); the
// question thread about it (GET /api/exams/:id/messages) and the caller's notifications.
import { z } from "zod";
import { FINDING_READS, SETTINGS } from "../catalogue";
import { applicationGuideSchema } from "./applications";

export const OUTCOMES = ["TP", "FP", "TN", "FN", "indeterminate"] as const;
export type Outcome = (typeof OUTCOMES)[number];

export const feedbackCriterionSchema = z.object({
  key: z.string(),
  label: z.string(),
  value: z.union([z.string(), z.number()]).nullable(),
  level: z.object({ label: z.string(), anchor: z.string(), ideal: z.boolean(), fails: z.boolean() }).nullable(),
  /** The criterion's help and the program's snippets, when the level is not the ideal one. */
  nextSteps: z.array(z.string()),
});
export type FeedbackCriterion = z.infer<typeof feedbackCriterionSchema>;

export const feedbackMessageSchema = z.object({ id: z.string(), body: z.string(), at: z.string(), author: z.string() });

/** GET /api/me/feedback/:id. */
export const feedbackSchema = z.object({
  examId: z.string(),
  code: z.string(),
  application: z.object({ code: z.string(), name: z.string() }),
  guide: applicationGuideSchema,
  performedAt: z.string(),
  setting: z.enum(SETTINGS),
  reviewedAt: z.string(),
  source: z.enum(["single_read", "double_read_agreed", "adjudicated"]),
  credit: z.boolean(),
  /** Why the exam earned no credit (empty when it did). */
  creditReasons: z.array(z.string()),
  rubricVersion: z.number().nullable(),
  criteria: z.array(feedbackCriterionSchema),
  findings: z.array(
    z.object({ key: z.string(), label: z.string(), yourRead: z.enum(FINDING_READS), referenceRead: z.enum(FINDING_READS), outcome: z.enum(OUTCOMES) }),
  ),
  /** reviewer is null when the program hides reviewer names from learners. */
  comments: z.array(z.object({ reviewer: z.string().nullable(), text: z.string(), at: z.string() })),
  adjudicationNote: z.string().nullable(),
  acknowledgedAt: z.string().nullable(),
  messages: z.array(feedbackMessageSchema),
});
export type Feedback = z.infer<typeof feedbackSchema>;

/** A list item: the feedback plus whether its notification is still unread. */
export const feedbackListItemSchema = feedbackSchema.extend({ unread: z.boolean() });
export type FeedbackListItem = z.infer<typeof feedbackListItemSchema>;
/** GET /api/me/feedback and GET /api/roster/:id/feedback. */
export const feedbackListSchema = z.object({ items: z.array(feedbackListItemSchema) });
export type FeedbackList = z.infer<typeof feedbackListSchema>;

/** POST /api/exams/:id/acknowledge. */
export const acknowledgementSchema = z.object({ acknowledgedAt: z.string() });
export type Acknowledgement = z.infer<typeof acknowledgementSchema>;

/** GET /api/exams/:id/messages: the thread, each author named as the caller may see them. */
export const messageThreadSchema = z.object({ examCode: z.string(), items: z.array(feedbackMessageSchema) });
export type MessageThread = z.infer<typeof messageThreadSchema>;
/** POST /api/exams/:id/messages. */
export const postedMessageSchema = z.object({ id: z.string() });

export const notificationSchema = z.object({
  id: z.string(),
  kind: z.string(),
  examId: z.string().nullable(),
  body: z.string(),
  read: z.boolean(),
  createdAt: z.string(),
});
export type Notification = z.infer<typeof notificationSchema>;
/** GET /api/notifications: the newest 100, unread first. */
export const notificationsSchema = z.object({ items: z.array(notificationSchema), unread: z.number() });
export type Notifications = z.infer<typeof notificationsSchema>;

export const markNotificationsReadSchema = z.object({ ids: z.array(z.uuid()).max(200).optional() });
