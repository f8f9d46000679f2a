// The current time as state, refreshed on an interval, for "ends in 12 min" style labels.
import { useEffect, useState } from "react";

/** Date.now(), re-read every `intervalMs`. */
export function useNow(intervalMs = 30_000): number {
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    const timer = window.setInterval(() => setNow(Date.now()), intervalMs);
    return () => window.clearInterval(timer);
  }, [intervalMs]);
  return now;
}
