// An agreement coefficient in a table cell, as the agreement report and calibration results
// write it: the value to two decimals with its 95 % interval beneath (or "no interval"), and
// a dash that says why when it could not be computed.
import type { Interval } from "../../../shared/schemas/reports";
import { formatCoefficient, formatInterval } from "../../lib/stat-format";

/** "—" with the reason as its tooltip and, for screen readers, in words. */
export function NotComputable({ reason }: { reason: string }) {
  return (
    <span title={reason} className="cursor-help text-slate-600 underline decoration-dotted underline-offset-2">
      —<span className="sr-only"> (not computable: {reason})</span>
    </span>
  );
}

/** The coefficient with its interval; `label` names both in data-stat attributes (tests find them by it). */
export function Coefficient({ value, ci, reason, label }: { value: number | null; ci?: Interval | null; reason: string; label: string }) {
  if (value === null) return <NotComputable reason={reason} />;
  return (
    <span className="inline-flex flex-col items-end">
      <span data-stat={label} className="font-semibold">
        {formatCoefficient(value)}
      </span>
      {ci ? (
        <span data-stat-interval={label} className="text-xs text-slate-600">
          {formatInterval(ci)}
        </span>
      ) : (
        <span className="text-xs text-slate-500">no interval</span>
      )}
    </span>
  );
}
