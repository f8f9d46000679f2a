// A bar of credited exams with the program's threshold marked on it. The scale stretches
// past the threshold once it is passed, so the mark stays visible; the figures are always
// written beside the bar (never the bar alone).
export function ThresholdBar({ credited, threshold, label }: { credited: number; threshold: number; label: string }) {
  const scale = Math.max(threshold, credited, 1);
  const fill = (credited / scale) * 100;
  const mark = (threshold / scale) * 100;
  const met = credited >= threshold;
  return (
    <div className="flex min-w-40 items-center gap-2">
      <div
        role="progressbar"
        aria-label={label}
        aria-valuemin={0}
        aria-valuemax={threshold}
        aria-valuenow={Math.min(credited, threshold)}
        aria-valuetext={`${credited} of ${threshold} credited exams`}
        className="relative h-3 flex-1 rounded-full bg-slate-200"
      >
        <div className={`h-full rounded-full ${met ? "bg-sea-700" : "bg-sea-500"}`} style={{ width: `${fill}%` }} />
        {/* The threshold: a dark tick across the bar, drawn above the fill. */}
        <div aria-hidden="true" className="absolute -top-1 -bottom-1 w-0.5 -translate-x-1/2 bg-ink-900" style={{ left: `${mark}%` }} />
      </div>
      <span className="w-16 text-right text-sm tabular-nums text-ink-900">
        {credited}
        <span className="text-slate-600"> / {threshold}</span>
      </span>
    </div>
  );
}
