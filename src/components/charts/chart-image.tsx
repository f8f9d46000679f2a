// The accessible shell every report chart sits in: one image with a name, so a screen
// reader announces the chart once instead of wandering through its SVG parts. The table
// beside each chart carries the figures; this names what the picture shows.
import type { ReactNode } from "react";

/** Wraps a chart as a single named image (`role="img"`), its accessible name from `label`. */
export function ChartImage({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div role="img" aria-label={label} className="font-sans">
      {children}
    </div>
  );
}
