// Who may do what in reviewing: never read your own exam, hold a claim only while its lease
// runs (README "Review rules"), and adjudicate only as a QA lead or the reviewer it was handed to.
import { HttpError, notFound } from "../http/errors";
import type { Role } from "../../shared/roles";
import { type ExamAccess } from "./exam";

/** What a reviewer would be doing with the exam; each act has its own words. */
export type ReadAct = "review" | "adjudicate" | "assign";

const OWN_EXAM: Record<ReadAct, [number, string]> = {
  review: [403, "You cannot review your own exam"],
  adjudicate: [403, "You cannot adjudicate your own exam"],
  assign: [409, "reviewerId: a reviewer never reads their own exam"],
};

/** The one rule "not your own exam": a sonographer never reviews, adjudicates or is handed a read of their own exam. */
export function assertNotOwnExam(exam: { sonographer_id: string }, userId: string, act: ReadAct) {
  if (exam.sonographer_id !== userId) return;
  const [status, message] = OWN_EXAM[act];
  throw new HttpError(status, "own_exam", message);
}

interface Lease {
  state: string;
  reviewer_id: string | null;
  assigned_to: string | null;
  /** Computed by the database clock (repositories/assignments.ts). */
  lease_over: boolean;
}

/** A claim whose lease ran out: the read went back to the queue, even while nobody has claimed it again. */
export const claimExpired = (a: Pick<Lease, "state" | "lease_over">) => a.state === "claimed" && a.lease_over;

const claimExpiredError = () =>
  new HttpError(409, "claim_expired", "Your claim on this exam ran out and the read went back to the queue; start the next exam to claim it again");

/** The caller's own live claim on an assignment, to change it (autosave, release, submit); 404/409 say why not. */
export function assertOwnClaim<A extends Lease>(a: A | undefined, userId: string): asserts a is A {
  if (!a || (a.reviewer_id !== userId && a.assigned_to !== userId)) throw notFound("Assignment");
  if (a.state === "submitted") throw new HttpError(409, "already_submitted", "This review has already been submitted");
  if (a.state !== "claimed" || a.reviewer_id !== userId)
    throw new HttpError(409, "not_claimed", "You no longer hold this exam: the claim expired and it went back to the queue");
  // README "Review rules": when the lease runs out the read goes back to the queue, so the holder lost it
  // even while nobody has claimed it again (claim it anew with "Start next").
  if (claimExpired(a)) throw claimExpiredError();
}

/** The caller may open the scoring workspace of an assignment: they hold (or held and submitted) it, and the lease did not run out. */
export function assertMayOpenWorkspace<A extends Lease>(a: A | undefined, userId: string): asserts a is A {
  if (!a || a.reviewer_id !== userId) throw notFound("Assignment");
  if (claimExpired(a)) throw claimExpiredError();
}

/** Only an unsubmitted, uncancelled read can be handed to someone. */
export function assertReassignable(a: { state: string }) {
  if (a.state === "submitted" || a.state === "cancelled") throw new HttpError(409, "not_open", `This read is ${a.state}`);
}

const isLead = (roles: readonly Role[]) => roles.includes("qa_lead");

/** Whose adjudications a caller sees: a QA lead every one, a reviewer only those handed to them. */
export const adjudicationsVisibleTo = (user: { id: string; roles: readonly Role[] }) => (isLead(user.roles) ? {} : { assignedTo: user.id });

/** A QA lead, or the reviewer the adjudication was handed to, sets the final scores. */
export function assertMayAdjudicate(user: { id: string; roles: readonly Role[] }, a: { assigned_to: string | null }) {
  if (!isLead(user.roles) && a.assigned_to !== user.id)
    throw new HttpError(403, "forbidden", "Only a QA lead or the reviewer chosen for this adjudication can set the final scores");
}

/**
 * The reviewer's page of an exam (GET /reviews/exams/:id) is for a QA lead or a reviewer with
 * a deciding read (examAccess "thread"); anyone else gets 404 as in policies/exam.ts.
 */
export function assertMayReadReviewedExam(access: ExamAccess | null) {
  if (access !== "reviewer" && access !== "lead") throw notFound("Exam");
}
