// One reviewed exam's feedback as the API sends it: to its sonographer (GET /api/me/feedback)
// and, with the reviewers always named, to a QA lead (GET /api/roster/:id/feedback).
import type { ExamSetting, FindingRead } from "../catalogue";

export type Outcome = "TP" | "FP" | "TN" | "FN" | "indeterminate";

export interface FeedbackCriterion {
  key: string;
  label: string;
  value: string | number | null;
  level: { label: string; anchor: string; ideal: boolean; fails: boolean } | null;
  /** The criterion's help and the program's snippets, when the level is not the ideal one. */
  nextSteps: string[];
}

export interface Feedback {
  examId: string;
  code: string;
  application: { code: string; name: string };
  performedAt: string;
  setting: ExamSetting;
  reviewedAt: string;
  source: "single_read" | "double_read_agreed" | "adjudicated";
  credit: boolean;
  /** Why the exam earned no credit (empty when it did). */
  creditReasons: string[];
  rubricVersion: number | null;
  criteria: FeedbackCriterion[];
  findings: { key: string; label: string; yourRead: FindingRead; referenceRead: FindingRead; outcome: Outcome }[];
  /** reviewer is null when the program hides reviewer names from learners. */
  comments: { reviewer: string | null; text: string; at: string }[];
  adjudicationNote: string | null;
  acknowledgedAt: string | null;
  messages: { id: string; body: string; at: string; author: string }[];
}

/** A list item: the feedback plus whether its notification is still unread. */
export type FeedbackListItem = Feedback & { unread: boolean };
