// The program's members. Actions appear only for administrators; the server checks anyway.
import { ROLE_LABELS } from "../../../../shared/roles";
import type { Member } from "../../../../shared/schemas/users";
import { formatDate, formatDateTime } from "../../../lib/format";
import { Button } from "../../../components/ui/button";
import { StatusTag } from "../../../components/ui/status-tag";

type Props = {
  members: Member[];
  currentUserId: string;
  canManage: boolean;
  /** QA leads and admins record the DICOM operator names of clinicians. */
  canEditOperatorNames: boolean;
  onEditOperatorNames: (member: Member) => void;
  onEditRoles: (member: Member) => void;
  onToggleActive: (member: Member) => void;
};

const th = "px-3 py-2 font-semibold";

export function MembersTable({ members, currentUserId, canManage, canEditOperatorNames, onEditOperatorNames, onEditRoles, onToggleActive }: Props) {
  return (
    <div className="overflow-x-auto rounded-lg border border-slate-200 bg-white">
      <table className="w-full text-left text-sm">
        <caption className="sr-only">Members of the program</caption>
        <thead className="border-b border-slate-200 bg-paper-200 text-xs uppercase tracking-wide text-slate-700">
          <tr>
            <th scope="col" className={th}>
              Name
            </th>
            <th scope="col" className={th}>
              E-mail
            </th>
            <th scope="col" className={th}>
              Roles
            </th>
            <th scope="col" className={th}>
              DICOM operator names
            </th>
            <th scope="col" className={th}>
              Status
            </th>
            <th scope="col" className={th}>
              Last sign-in
            </th>
            {canManage || canEditOperatorNames ? (
              <th scope="col" className={th}>
                <span className="sr-only">Actions</span>
              </th>
            ) : null}
          </tr>
        </thead>
        <tbody className="divide-y divide-slate-100">
          {members.map((m) => {
            const isSelf = m.id === currentUserId;
            return (
              <tr key={m.id} className={m.active ? "" : "bg-slate-50"}>
                <th scope="row" className="px-3 py-2 font-semibold text-ink-950">
                  {m.name}
                  {isSelf ? <span className="ml-1 font-normal text-slate-600">(you)</span> : null}
                  <span className="block text-xs font-normal text-slate-600">Joined {formatDate(m.joinedAt)}</span>
                </th>
                <td className="whitespace-nowrap px-3 py-2 text-ink-900">{m.email}</td>
                <td className="px-3 py-2 text-ink-900">{m.roles.map((r) => ROLE_LABELS[r]).join(", ") || "—"}</td>
                <td className="px-3 py-2 font-mono text-xs text-ink-900">
                  {m.roles.includes("sonographer") ? m.dicomOperatorNames.join(", ") || <span className="font-sans text-slate-600">None</span> : null}
                </td>
                <td className="px-3 py-2">{m.active ? <StatusTag tone="good">Active</StatusTag> : <StatusTag tone="off">Deactivated</StatusTag>}</td>
                <td className="whitespace-nowrap px-3 py-2 tabular-nums text-ink-900">
                  {m.lastSignInAt ? formatDateTime(m.lastSignInAt) : <span className="text-slate-600">Never</span>}
                </td>
                {canManage || canEditOperatorNames ? (
                  <td className="whitespace-nowrap px-3 py-2 text-right">
                    <div className="flex justify-end gap-1">
                      {canEditOperatorNames && m.roles.includes("sonographer") ? (
                        <Button variant="ghost" size="sm" onClick={() => onEditOperatorNames(m)} aria-label={`DICOM operator names of ${m.name}`}>
                          Operator names
                        </Button>
                      ) : null}
                      {canManage ? (
                        <Button variant="ghost" size="sm" onClick={() => onEditRoles(m)} aria-label={`Change roles of ${m.name}`}>
                          Change roles
                        </Button>
                      ) : null}
                      {isSelf || !canManage ? null : (
                        <Button variant="ghost" size="sm" onClick={() => onToggleActive(m)} aria-label={`${m.active ? "Deactivate" : "Reactivate"} ${m.name}`}>
                          {m.active ? "Deactivate" : "Reactivate"}
                        </Button>
                      )}
                    </div>
                  </td>
                ) : null}
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
