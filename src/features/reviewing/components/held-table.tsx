// The exams I hold: each claim with its exam code and when the claim runs out (it returns
// to the queue then), and a way back into the workspace.
import { Link } from "react-router-dom";
import type { HeldAssignment } from "../api/workspace";
import { buttonClasses } from "../../../components/ui/button";
import { formatUntil } from "../../../lib/duration";
import { formatDateTime } from "../../../lib/format";

const KIND_LABELS: Record<string, string> = { primary: "First read", second: "Second read", adjudication: "Adjudication" };

export function HeldTable({ held, now }: { held: HeldAssignment[]; now: number }) {
  return (
    <div className="overflow-x-auto rounded-lg border border-slate-200 bg-white">
      <table className="w-full text-sm">
        <caption className="sr-only">Exams you hold</caption>
        <thead className="border-b border-slate-200 bg-paper-200 text-left text-xs uppercase tracking-wide text-slate-600">
          <tr>
            <th scope="col" className="px-3 py-2 font-semibold">
              Exam
            </th>
            <th scope="col" className="px-3 py-2 font-semibold">
              Application
            </th>
            <th scope="col" className="px-3 py-2 font-semibold">
              Read
            </th>
            <th scope="col" className="px-3 py-2 font-semibold">
              Claimed
            </th>
            <th scope="col" className="px-3 py-2 font-semibold">
              Claim ends
            </th>
            <th scope="col" className="px-3 py-2">
              <span className="sr-only">Actions</span>
            </th>
          </tr>
        </thead>
        <tbody className="divide-y divide-slate-100">
          {held.map((h) => (
            <tr key={h.id}>
              <th scope="row" className="px-3 py-1.5 text-left font-mono font-semibold text-ink-950">
                {h.examCode}
              </th>
              <td className="px-3 py-1.5 text-ink-900">{h.application}</td>
              <td className="px-3 py-1.5 text-ink-900">{KIND_LABELS[h.kind] ?? h.kind}</td>
              <td className="px-3 py-1.5 tabular-nums text-ink-900">{formatDateTime(h.claimedAt)}</td>
              <td className="px-3 py-1.5 tabular-nums text-ink-900">
                {formatDateTime(h.leaseExpiresAt)} <span className="text-slate-600">({formatUntil(h.leaseExpiresAt, now)})</span>
              </td>
              <td className="px-3 py-1.5 text-right">
                <Link to={`/queue/${h.id}`} className={buttonClasses("secondary", "sm")} aria-label={`Continue scoring exam ${h.examCode}`}>
                  Continue
                </Link>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
