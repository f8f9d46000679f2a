// The audit entries as a table. Details stay folded so long entries do not stretch rows.
import type { AuditEntry } from "../../../../shared/schemas/users";
import { formatDateTime } from "../../../lib/format";

function Details({ details }: { details: AuditEntry["details"] }) {
  if (!details || Object.keys(details).length === 0) return <span className="text-slate-600">—</span>;
  const entries = Object.entries(details);
  const summary = entries
    .slice(0, 2)
    .map(([k, v]) => `${k}: ${typeof v === "object" ? JSON.stringify(v) : String(v)}`)
    .join(", ");
  return (
    <details>
      <summary className="cursor-pointer truncate text-sea-700">{summary.length > 60 ? `${summary.slice(0, 60)}…` : summary}</summary>
      <pre className="mt-1 max-w-md overflow-x-auto whitespace-pre-wrap break-all rounded bg-paper-200 p-2 text-xs text-ink-900">
        {JSON.stringify(details, null, 2)}
      </pre>
    </details>
  );
}

export function AuditTable({ entries }: { entries: AuditEntry[] }) {
  return (
    <div className="overflow-x-auto rounded-lg border border-slate-200 bg-white">
      <table className="w-full text-left text-sm">
        <caption className="sr-only">Audit log entries, newest first</caption>
        <thead className="border-b border-slate-200 bg-paper-200 text-xs uppercase tracking-wide text-slate-700">
          <tr>
            <th scope="col" className="px-3 py-2 font-semibold">
              When
            </th>
            <th scope="col" className="px-3 py-2 font-semibold">
              Who
            </th>
            <th scope="col" className="px-3 py-2 font-semibold">
              Action
            </th>
            <th scope="col" className="px-3 py-2 font-semibold">
              Record
            </th>
            <th scope="col" className="px-3 py-2 font-semibold">
              IP address
            </th>
            <th scope="col" className="px-3 py-2 font-semibold">
              Details
            </th>
          </tr>
        </thead>
        <tbody className="divide-y divide-slate-100">
          {entries.map((e) => (
            <tr key={e.id} className="align-top">
              <td className="whitespace-nowrap px-3 py-2 tabular-nums text-ink-900">{formatDateTime(e.at)}</td>
              <td className="px-3 py-2 text-ink-900">{e.actor ?? <span className="text-slate-600">System</span>}</td>
              <td className="px-3 py-2">
                <code className="text-ink-900">{e.action}</code>
              </td>
              <td className="px-3 py-2 text-ink-900">
                {e.entityType ? (
                  <>
                    {e.entityType}
                    {e.entityId ? (
                      <span className="block font-mono text-xs text-slate-600" title={e.entityId}>
                        {e.entityId.length > 12 ? `${e.entityId.slice(0, 8)}…` : e.entityId}
                      </span>
                    ) : null}
                  </>
                ) : (
                  <span className="text-slate-600">—</span>
                )}
              </td>
              <td className="whitespace-nowrap px-3 py-2 font-mono text-xs tabular-nums text-slate-700">{e.ip ?? "—"}</td>
              <td className="px-3 py-2">
                <Details details={e.details} />
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
