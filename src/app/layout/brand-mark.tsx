// The Soundings mark: three depth lines shortening toward the deep, as on a chart margin.
export function BrandMark({ className = "size-7" }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" aria-hidden="true" className={className}>
      <rect width="32" height="32" rx="6" fill="#0c1a26" />
      <path d="M6 11h20M6 17h14M6 23h8" stroke="#74bdb8" strokeWidth="2.5" strokeLinecap="round" />
      <circle cx="24" cy="23" r="1.6" fill="#fbfaf7" />
    </svg>
  );
}

export function Wordmark() {
  return (
    <span className="flex items-center gap-2">
      <BrandMark />
      <span className="text-lg font-semibold tracking-tight text-ink-950">Soundings</span>
    </span>
  );
}
