// A small status label that always carries a word and an icon, so status never rests on colour.
import type { ReactNode } from "react";
import { Circle, CircleAlert, CircleCheck, CircleMinus, Clock } from "lucide-react";

type Tone = "good" | "neutral" | "waiting" | "problem" | "off";

const tones: Record<Tone, { className: string; Icon: typeof Circle }> = {
  good: { className: "bg-sea-50 text-sea-800 ring-sea-200", Icon: CircleCheck },
  neutral: { className: "bg-slate-50 text-slate-700 ring-slate-200", Icon: Circle },
  waiting: { className: "bg-sand-50 text-sand-800 ring-sand-200", Icon: Clock },
  problem: { className: "bg-coral-50 text-coral-800 ring-coral-200", Icon: CircleAlert },
  off: { className: "bg-slate-100 text-slate-700 ring-slate-300", Icon: CircleMinus },
};

export function StatusTag({ tone, children }: { tone: Tone; children: ReactNode }) {
  const { className, Icon } = tones[tone];
  return (
    <span className={`inline-flex items-center gap-1 rounded-full px-2 py-0.5 text-xs font-semibold ring-1 ring-inset ${className}`}>
      <Icon aria-hidden="true" className="size-3.5" />
      {children}
    </span>
  );
}
