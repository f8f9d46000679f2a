// Names a disagreement key ("depth", "read.free_fluid_ruq") in words for the QA lead.
import type { Adjudication } from "../api/oversight";

/** The criterion's label, or "Read: <finding key in words>" for a finding. */
export function disagreementLabel(key: string, item: Pick<Adjudication, "rubric">, findingLabels: Record<string, string> = {}): string {
  if (key.startsWith("read.")) {
    const finding = key.slice(5);
    return `Read of ${findingLabels[finding] ?? finding.replace(/_/g, " ")}`;
  }
  return item.rubric?.criteria.find((c) => c.key === key)?.label ?? key;
}
