// File sizes in words people read ("12.4 MB"), in the reader's locale.
const oneDecimal = new Intl.NumberFormat(undefined, { maximumFractionDigits: 1 });

/** "820 kB", "12.4 MB" — decimal units, as file managers show them. */
export function formatBytes(bytes: number): string {
  if (bytes < 1000) return `${bytes} B`;
  if (bytes < 1_000_000) return `${oneDecimal.format(bytes / 1000)} kB`;
  if (bytes < 1_000_000_000) return `${oneDecimal.format(bytes / 1_000_000)} MB`;
  return `${oneDecimal.format(bytes / 1_000_000_000)} GB`;
}
