// Autosave of the reviewer's draft: a debounced PUT after each change, a save every few
// minutes while working (which also keeps the claim alive), and a last keepalive save when
// the page goes away, so a reload loses nothing. Stops for good once the claim is gone.
// While the server is unreachable or answers 503 the draft stays on screen and is sent
// again with a doubling delay ("waiting"), until it is saved.
import { useCallback, useEffect, useRef, useState } from "react";
import { isApiError, errorMessage } from "../../../lib/api-errors";
import { isTransientError, retryDelayMs } from "../../../lib/retry";
import { saveDraft, saveDraftOnExit, type DraftBody } from "../api/scoring";

export type SaveState =
  | { kind: "idle"; savedAt: string | null }
  | { kind: "pending" }
  | { kind: "saving" }
  | { kind: "saved"; savedAt: string; leaseExpiresAt: string }
  | { kind: "failed"; message: string }
  | { kind: "waiting"; message: string; retryAt: number }
  | { kind: "lost"; message: string };

const DEBOUNCE_MS = 800;
const KEEP_ALIVE_MS = 4 * 60_000;

/**
 * `body()` builds the current draft; `version` changes whenever the reviewer changes
 * something. Returns the save state and `cancel()` (call it before submitting).
 */
export function useDraftAutosave(assignmentId: string, body: () => DraftBody, version: number, restoredAt: string | null) {
  const [state, setState] = useState<SaveState>({ kind: "idle", savedAt: restoredAt });
  const bodyRef = useRef(body);
  const dirty = useRef(false);
  const stopped = useRef(false);
  const timer = useRef<number | undefined>(undefined);
  const savedVersion = useRef(version);
  const retries = useRef(0);
  const retryLater = useRef<() => void>(() => undefined);

  useEffect(() => {
    bodyRef.current = body;
  });

  const save = useCallback(async () => {
    window.clearTimeout(timer.current);
    if (stopped.current) return;
    dirty.current = false;
    setState({ kind: "saving" });
    try {
      const r = await saveDraft(assignmentId, bodyRef.current());
      retries.current = 0;
      if (!stopped.current) setState((s) => (s.kind === "saving" ? { kind: "saved", savedAt: r.savedAt, leaseExpiresAt: r.leaseExpiresAt } : s));
    } catch (error) {
      if (stopped.current) return;
      if (isApiError(error, 409) || isApiError(error, 404)) {
        stopped.current = true;
        setState({ kind: "lost", message: errorMessage(error, "You no longer hold this exam.") });
      } else if (isTransientError(error)) {
        // Not the draft's fault: keep it and try again later (a newer change saves sooner).
        dirty.current = true;
        const delay = retryDelayMs(retries.current++);
        setState({ kind: "waiting", message: errorMessage(error, "The server is not reachable."), retryAt: Date.now() + delay });
        timer.current = window.setTimeout(() => retryLater.current(), delay);
      } else {
        dirty.current = true;
        setState({ kind: "failed", message: errorMessage(error, "The draft could not be saved.") });
      }
    }
  }, [assignmentId]);

  useEffect(() => {
    retryLater.current = () => void save();
  }, [save]);

  // Debounced save after each change (not for the state restored on load).
  useEffect(() => {
    if (version === savedVersion.current || stopped.current) return;
    savedVersion.current = version;
    dirty.current = true;
    setState({ kind: "pending" });
    window.clearTimeout(timer.current);
    timer.current = window.setTimeout(() => void save(), DEBOUNCE_MS);
  }, [version, save]);

  // A save now and then while the tab is in use keeps time spent current and the claim alive.
  useEffect(() => {
    const keepAlive = window.setInterval(() => {
      if (document.visibilityState === "visible") void save();
    }, KEEP_ALIVE_MS);
    return () => window.clearInterval(keepAlive);
  }, [save]);

  // Leaving: a reload or closed tab gets a keepalive request; leaving within the app a normal save.
  useEffect(() => {
    const onHide = () => {
      if (dirty.current && !stopped.current) {
        dirty.current = false;
        saveDraftOnExit(assignmentId, bodyRef.current());
      }
    };
    window.addEventListener("pagehide", onHide);
    return () => {
      window.removeEventListener("pagehide", onHide);
      window.clearTimeout(timer.current);
      onHide();
    };
  }, [assignmentId]);

  const cancel = useCallback(() => {
    window.clearTimeout(timer.current);
    stopped.current = true;
    dirty.current = false;
  }, []);

  /** Allows saving again after cancel() (a submit that failed validation). */
  const resume = useCallback(() => {
    stopped.current = false;
  }, []);

  return { state, cancel, resume, saveNow: save };
}
