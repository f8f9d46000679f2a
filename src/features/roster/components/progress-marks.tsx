// Small marks of the roster: a sonographer's flags and an application's learning-curve
// signal, each as an icon with words (never colour alone; coral only for problems), and a
// compact credited-against-threshold bar with the count written beside it.
import type { LucideIcon } from "lucide-react";
import { CircleAlert, CircleCheck, CircleDashed, Clock, MessageSquareWarning, TrendingDown } from "lucide-react";
import { ROSTER_FLAG_LABELS, type CusumView, type RosterFlag } from "../../../../shared/schemas/progress";

type Tone = "good" | "neutral" | "waiting" | "problem";

const toneClasses: Record<Tone, string> = {
  good: "bg-sea-50 text-sea-800 ring-sea-200",
  neutral: "bg-slate-50 text-slate-700 ring-slate-200",
  waiting: "bg-sand-50 text-sand-800 ring-sand-200",
  problem: "bg-coral-50 text-coral-800 ring-coral-200",
};

function Tag({ tone, Icon, children, title, nowrap = false }: { tone: Tone; Icon: LucideIcon; children: string; title?: string; nowrap?: boolean }) {
  return (
    <span
      title={title}
      className={`inline-flex items-center gap-1 rounded-xl px-2 py-0.5 text-xs font-semibold ring-1 ring-inset ${nowrap ? "whitespace-nowrap" : ""} ${toneClasses[tone]}`}
    >
      <Icon aria-hidden="true" className="size-3.5 shrink-0" />
      <span className="min-w-0">{children}</span>
    </span>
  );
}

/** How each flag looks: a long quiet spell is a note (sand); the others are problems (coral). */
const FLAG_LOOK: Record<RosterFlag, { tone: Tone; Icon: LucideIcon }> = {
  stalled: { tone: "waiting", Icon: Clock },
  falling_quality: { tone: "problem", Icon: TrendingDown },
  follow_up_open: { tone: "problem", Icon: MessageSquareWarning },
  cusum_unacceptable: { tone: "problem", Icon: CircleAlert },
};

export function FlagTag({ flag }: { flag: RosterFlag }) {
  const { tone, Icon } = FLAG_LOOK[flag];
  return (
    <Tag tone={tone} Icon={Icon}>
      {ROSTER_FLAG_LABELS[flag]}
    </Tag>
  );
}

/** The learning-curve signal in a word or two. */
export const SIGNAL_WORDS: Record<CusumView["signal"], string> = {
  competent: "Acceptable rate reached",
  unacceptable: "Unacceptable",
  none: "No signal yet",
};

const SIGNAL_TITLES: Record<CusumView["signal"], string> = {
  competent: "The learning curve shows the acceptable failure rate reached (a statistical signal, not a certification)",
  unacceptable: "The learning curve has signalled an unacceptable failure rate",
  none: "The learning curve has not crossed a decision limit yet",
};

export function SignalTag({ signal }: { signal: CusumView["signal"] }) {
  const look =
    signal === "competent"
      ? { tone: "good" as const, Icon: CircleCheck }
      : signal === "unacceptable"
        ? { tone: "problem" as const, Icon: CircleAlert }
        : { tone: "neutral" as const, Icon: CircleDashed };
  return (
    <Tag tone={look.tone} Icon={look.Icon} title={SIGNAL_TITLES[signal]} nowrap>
      {SIGNAL_WORDS[signal]}
    </Tag>
  );
}

/** Credited exams against the threshold: a thin bar plus "12/25" (and "met" in words once reached). */
export function CompactProgress({ credited, threshold, met, label }: { credited: number; threshold: number; met: boolean; label: string }) {
  const share = threshold > 0 ? Math.min(1, credited / threshold) : 1;
  return (
    <span className="inline-flex items-center gap-2">
      <span
        role="progressbar"
        aria-label={label}
        aria-valuemin={0}
        aria-valuemax={threshold}
        aria-valuenow={Math.min(credited, threshold)}
        aria-valuetext={`${credited} of ${threshold} credited exams${met ? ", threshold met" : ""}`}
        className="h-1.5 w-16 overflow-hidden rounded-full bg-slate-200"
      >
        <span className={`block h-full rounded-full ${met ? "bg-sea-700" : "bg-sea-500"}`} style={{ width: `${Math.round(share * 100)}%` }} />
      </span>
      <span className="whitespace-nowrap text-xs tabular-nums text-ink-900">
        {credited}/{threshold}
        {met ? (
          <span className="ml-1 inline-flex items-center gap-0.5 font-semibold text-sea-800">
            <CircleCheck aria-hidden="true" className="size-3" />
            met
          </span>
        ) : null}
      </span>
    </span>
  );
}
