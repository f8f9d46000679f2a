// The learning curve in words, in one place so the learner's screen, the QA lead's page of a
// sonographer and the tests agree on how a signal reads (figures: src/lib/stat-format.ts).
import type { CusumView } from "../../../../shared/schemas/progress";
import { formatDate } from "../../../lib/format";
import { percent } from "../../../lib/stat-format";

/** Who reads a progress screen: the learner themselves or the QA lead looking at a learner. */
export type ProgressViewer = "learner" | "lead";

/** The learning curve's result as one plain sentence. */
export function cusumSentence(c: CusumView, viewer: ProgressViewer = "learner"): string {
  if (c.signal === "competent" && c.signalAtAttempt !== null)
    return `Acceptable failure rate reached at attempt ${c.signalAtAttempt}${c.signalAtDate ? ` (${formatDate(c.signalAtDate)})` : ""}`;
  if (c.signal === "unacceptable" && c.signalAtAttempt !== null)
    return `Unacceptable failure rate signalled at attempt ${c.signalAtAttempt}${c.signalAtDate ? ` (${formatDate(c.signalAtDate)})` : ""} — ${viewer === "learner" ? "talk to your QA lead" : "worth a conversation with the clinician"}`;
  const n = c.points.length;
  return n === 0 ? "No reviewed exams yet" : `No signal yet after ${n} reviewed ${n === 1 ? "exam" : "exams"}`;
}

/** The four CUSUM settings in plain words, each with its symbol. */
export function cusumParameters(c: Pick<CusumView, "p0" | "p1" | "alpha" | "beta">): { key: string; words: string; value: string }[] {
  return [
    { key: "p0", words: "Acceptable failure rate (p0)", value: percent(c.p0, c.p0 * 100 < 1 ? 1 : 0) },
    { key: "p1", words: "Unacceptable failure rate (p1)", value: percent(c.p1, c.p1 * 100 < 1 ? 1 : 0) },
    { key: "alpha", words: "Risk of signalling “unacceptable” when the rate is acceptable (α)", value: percent(c.alpha, c.alpha * 100 < 1 ? 1 : 0) },
    {
      key: "beta",
      words: "Risk of signalling the acceptable rate reached when the rate is unacceptable (β)",
      value: percent(c.beta, c.beta * 100 < 1 ? 1 : 0),
    },
  ];
}

/** What counts as a failure on the learning curve, in one line. */
export const FAILURE_MEANING = "A failure is a reviewed exam that earned no credentialing credit; exams count in the order they were performed.";
