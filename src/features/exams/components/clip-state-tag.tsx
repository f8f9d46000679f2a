// A clip's processing state in a word and an icon: queued → processing → ready | failed.
import type { Clip } from "../../../../shared/schemas/exams";
import { StatusTag } from "../../../components/ui/status-tag";

const STATES: Record<Clip["state"], { tone: "good" | "waiting" | "problem"; label: string }> = {
  queued: { tone: "waiting", label: "Queued" },
  processing: { tone: "waiting", label: "Processing" },
  ready: { tone: "good", label: "Ready" },
  failed: { tone: "problem", label: "Failed" },
};

export function ClipStateTag({ state }: { state: Clip["state"] }) {
  const { tone, label } = STATES[state];
  return <StatusTag tone={tone}>{label}</StatusTag>;
}
