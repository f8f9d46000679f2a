// The draft's save state in words, in a polite live region ("Saved 12:03"), beside the time
// spent on the exam. Time counts only while the workspace has focus.
import { CircleAlert, CircleCheck, CloudOff, LoaderCircle, Timer } from "lucide-react";
import { formatElapsed } from "../../../lib/duration";
import { useTicking } from "../hooks/use-focused-seconds";
import type { SaveState } from "../hooks/use-draft-autosave";

const clock = new Intl.DateTimeFormat(undefined, { hour: "2-digit", minute: "2-digit" });
const at = (iso: string) => clock.format(new Date(iso));

export function SaveStatus({ state }: { state: SaveState }) {
  let content;
  if (state.kind === "saving" || state.kind === "pending") {
    content = (
      <>
        <LoaderCircle aria-hidden="true" className="size-3.5 animate-spin text-sea-600" />
        Saving…
      </>
    );
  } else if (state.kind === "saved") {
    content = (
      <>
        <CircleCheck aria-hidden="true" className="size-3.5 text-sea-700" />
        Saved {at(state.savedAt)}
      </>
    );
  } else if (state.kind === "waiting") {
    content = (
      <span className="inline-flex items-center gap-1 font-semibold text-amber-800" title={state.message}>
        <CloudOff aria-hidden="true" className="size-3.5" />
        Waiting for the server; your scores are kept here and will be saved
      </span>
    );
  } else if (state.kind === "failed" || state.kind === "lost") {
    content = (
      <span className="inline-flex items-center gap-1 font-semibold text-coral-700">
        <CircleAlert aria-hidden="true" className="size-3.5" />
        Not saved
      </span>
    );
  } else {
    content = state.savedAt ? <>Draft restored (saved {at(state.savedAt)})</> : <>Saves as you go</>;
  }
  return (
    <p role="status" aria-live="polite" aria-atomic="true" className="inline-flex items-center gap-1 text-xs text-slate-700">
      {content}
    </p>
  );
}

export function TimeSpent({ seconds, initial }: { seconds: { current: number }; initial: number }) {
  const value = useTicking(seconds, initial);
  return (
    <p className="inline-flex items-center gap-1 text-xs tabular-nums text-slate-700" title="Counted while this screen has focus">
      <Timer aria-hidden="true" className="size-3.5" />
      <span className="sr-only">Time on this exam:</span>
      {formatElapsed(value)}
    </p>
  );
}
