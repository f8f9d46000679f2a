// Time spent on an exam: seconds counted only while the tab is visible and the window has
// focus, so a workspace left open over lunch does not inflate the figure.
import { useEffect, useRef, useState } from "react";

/** A ref holding the focused seconds so far (starting from `initial`), ticking once a second. */
export function useFocusedSeconds(initial: number) {
  const seconds = useRef(initial);
  useEffect(() => {
    const timer = window.setInterval(() => {
      if (document.visibilityState === "visible" && document.hasFocus()) seconds.current += 1;
    }, 1000);
    return () => window.clearInterval(timer);
  }, []);
  return seconds;
}

/** Re-renders every second with the ref's value, for a small readout (keeps the big tree still). */
export function useTicking(ref: { current: number }, initial: number): number {
  const [value, setValue] = useState(initial);
  useEffect(() => {
    const timer = window.setInterval(() => setValue(ref.current), 1000);
    return () => window.clearInterval(timer);
  }, [ref]);
  return value;
}
