// Lengths of time in words that read at a glance: "2 d 4 h", "3 h 12 min", "45 s".

/** A waiting time or age, to the two largest units: "2 d 4 h", "3 h 12 min", "8 min", "under 1 min". */
export function formatWaited(totalSeconds: number): string {
  const s = Math.max(0, Math.floor(totalSeconds));
  if (s < 60) return "under 1 min";
  const days = Math.floor(s / 86_400);
  const hours = Math.floor((s % 86_400) / 3600);
  const minutes = Math.floor((s % 3600) / 60);
  if (days > 0) return hours > 0 ? `${days} d ${hours} h` : `${days} d`;
  if (hours > 0) return minutes > 0 ? `${hours} h ${minutes} min` : `${hours} h`;
  return `${minutes} min`;
}

/** A stopwatch reading: "45 s", "4 min 05 s", "1 h 02 min". */
export function formatElapsed(totalSeconds: number): string {
  const s = Math.max(0, Math.floor(totalSeconds));
  const pad = (n: number) => String(n).padStart(2, "0");
  if (s < 60) return `${s} s`;
  if (s < 3600) return `${Math.floor(s / 60)} min ${pad(s % 60)} s`;
  return `${Math.floor(s / 3600)} h ${pad(Math.floor((s % 3600) / 60))} min`;
}

/** Time until an instant, in words: "in 24 min", or "expired". */
export function formatUntil(iso: string | null | undefined, now = Date.now()): string {
  if (!iso) return "—";
  const ms = new Date(iso).getTime() - now;
  if (Number.isNaN(ms)) return "—";
  if (ms <= 0) return "expired";
  return `in ${formatWaited(ms / 1000)}`;
}
