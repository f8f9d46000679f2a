// What a blinded reviewer knows of the exam: its code, application, setting, transducer,
// preset and indication — the sonographer only when the program has turned blinding off.
import { EyeOff } from "lucide-react";
import type { BlindedExam } from "../api/workspace";
import { SETTING_LABELS, TRANSDUCER_LABELS } from "../../../lib/catalogue";
import { formatDateTime } from "../../../lib/format";
import { ApplicationCautions } from "../../../components/ui/cautions";

export function ExamFacts({ exam, leaseExpiresAt }: { exam: BlindedExam; leaseExpiresAt: string | null }) {
  const facts: [string, string][] = [
    ["Application", `${exam.application.name} (catalogue v${exam.guide.version})`],
    ["Setting", SETTING_LABELS[exam.setting] ?? exam.setting],
    ["Transducer", TRANSDUCER_LABELS[exam.transducer] ?? exam.transducer],
    ["Preset", exam.preset || "—"],
    ["Performed", formatDateTime(exam.performedAt)],
    ["Claim ends", formatDateTime(leaseExpiresAt)],
  ];
  return (
    <div className="mt-1.5 space-y-1">
      <dl className="flex flex-wrap gap-x-4 gap-y-0.5 text-xs">
        {facts.map(([k, v]) => (
          <div key={k} className="flex gap-1">
            <dt className="text-slate-600">{k}</dt>
            <dd className="font-semibold text-ink-900 tabular-nums">{v}</dd>
          </div>
        ))}
        <div className="flex gap-1">
          <dt className="text-slate-600">Clinician</dt>
          <dd className="font-semibold text-ink-900">
            {exam.sonographer ? (
              `${exam.sonographer.name} (blinding is off in this program)`
            ) : (
              <span className="inline-flex items-center gap-1">
                <EyeOff aria-hidden="true" className="size-3" />
                Blinded
              </span>
            )}
          </dd>
        </div>
      </dl>
      <p className="max-w-prose text-xs text-slate-700">
        <span className="text-slate-600">Indication </span>
        <span className="whitespace-pre-line text-ink-900">{exam.indication || "—"}</span>
      </p>
      <ApplicationCautions cautions={exam.guide.cautions} compact />
    </div>
  );
}
