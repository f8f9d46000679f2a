// Form-level messages (wrong password, too many attempts, saved). The live region is always
// rendered so assistive technology announces the message the moment it appears.
import { CircleAlert, CircleCheck } from "lucide-react";

type Tone = "problem" | "success" | "info";

const tones: Record<Tone, string> = {
  problem: "border-coral-600 bg-coral-50 text-coral-800",
  success: "border-sea-600 bg-sea-50 text-sea-800",
  info: "border-slate-300 bg-slate-50 text-ink-900",
};

export function FormMessage({ message, tone = "problem" }: { message?: string | null; tone?: Tone }) {
  const Icon = tone === "problem" ? CircleAlert : CircleCheck;
  return (
    <div aria-live={tone === "problem" ? "assertive" : "polite"} aria-atomic="true">
      {message ? (
        <div role={tone === "problem" ? "alert" : "status"} className={`flex items-start gap-2 rounded-md border-l-4 px-3 py-2 text-sm ${tones[tone]}`}>
          {tone === "info" ? null : <Icon aria-hidden="true" className="mt-0.5 size-4 shrink-0" />}
          <p>{message}</p>
        </div>
      ) : null}
    </div>
  );
}
