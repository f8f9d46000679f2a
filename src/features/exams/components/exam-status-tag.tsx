// An exam's status in a word and an icon.
import type { Exam } from "../../../../shared/schemas/exams";
import { StatusTag } from "../../../components/ui/status-tag";

export function ExamStatusTag({ status }: { status: Exam["status"] }) {
  return status === "submitted" ? <StatusTag tone="good">Submitted</StatusTag> : <StatusTag tone="neutral">Draft</StatusTag>;
}
