// An exam's status in a word and an icon, in the sonographer's terms: a draft, sent and
// waiting at some stage of review, or reviewed.
import type { Exam } from "../../../../shared/schemas/exams";
import { StatusTag } from "../../../components/ui/status-tag";

// Keyed by string so a status added on the server still shows (as its own word) until named here.
const STATUSES: Record<string, { tone: "neutral" | "waiting" | "good"; label: string } | undefined> = {
  draft: { tone: "neutral", label: "Draft" },
  submitted: { tone: "waiting", label: "Submitted" },
  in_review: { tone: "waiting", label: "In review" },
  adjudication: { tone: "waiting", label: "In adjudication" },
  reviewed: { tone: "good", label: "Reviewed" },
};

export function ExamStatusTag({ status }: { status: Exam["status"] }) {
  const { tone, label } = STATUSES[status] ?? { tone: "neutral", label: status };
  return <StatusTag tone={tone}>{label}</StatusTag>;
}
