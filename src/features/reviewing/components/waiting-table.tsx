// What waits for me, by application and setting: how many exams, and how long the oldest
// has waited. Clinical work is listed first, as the queue serves it first.
import type { WaitingGroup } from "../api/workspace";
import { SETTING_LABELS } from "../../../lib/catalogue";
import { formatWaited } from "../../../lib/duration";
import { formatCount } from "../../../lib/stat-format";

const SETTING_ORDER = { clinical: 0, educational: 1, simulated: 2 } as const;

export function sortWaiting(groups: WaitingGroup[]): WaitingGroup[] {
  return [...groups].sort((a, b) => SETTING_ORDER[a.setting] - SETTING_ORDER[b.setting] || b.oldestWaitingSeconds - a.oldestWaitingSeconds);
}

export function WaitingTable({ groups }: { groups: WaitingGroup[] }) {
  return (
    <div className="overflow-x-auto rounded-lg border border-slate-200 bg-white">
      <table className="w-full text-sm">
        <caption className="sr-only">Exams waiting for a read, by application and setting</caption>
        <thead className="border-b border-slate-200 bg-paper-200 text-left text-xs uppercase tracking-wide text-slate-600">
          <tr>
            <th scope="col" className="px-3 py-2 font-semibold">
              Application
            </th>
            <th scope="col" className="px-3 py-2 font-semibold">
              Setting
            </th>
            <th scope="col" className="px-3 py-2 text-right font-semibold">
              Waiting
            </th>
            <th scope="col" className="px-3 py-2 text-right font-semibold">
              Oldest has waited
            </th>
          </tr>
        </thead>
        <tbody className="divide-y divide-slate-100">
          {sortWaiting(groups).map((g) => (
            <tr key={`${g.application.code}-${g.setting}`}>
              <th scope="row" className="px-3 py-1.5 text-left font-semibold text-ink-950">
                {g.application.name}
              </th>
              <td className="px-3 py-1.5 text-ink-900">{SETTING_LABELS[g.setting] ?? g.setting}</td>
              <td className="px-3 py-1.5 text-right tabular-nums text-ink-950">{formatCount(g.count)}</td>
              <td className="px-3 py-1.5 text-right tabular-nums text-ink-900">{formatWaited(g.oldestWaitingSeconds)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
