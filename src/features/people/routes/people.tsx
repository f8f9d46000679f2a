// Setup → People: who is in the program and with which roles. QA leads can look;
// administrators can also invite, change roles and deactivate.
import { useState } from "react";
import { useQuery } from "@tanstack/react-query";
import type { Member } from "../../../../shared/schemas/users";
import { sessionQuery } from "../../../lib/session";
import { PageHeader } from "../../../components/ui/page-header";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { useMembers } from "../api/people";
import { EditRolesDialog } from "../components/edit-roles-dialog";
import { InvitationsList } from "../components/invitations-list";
import { InviteForm } from "../components/invite-form";
import { MemberActiveDialog } from "../components/member-active-dialog";
import { MembersTable } from "../components/members-table";
import { OperatorNamesDialog } from "../components/operator-names-dialog";

export default function PeoplePage() {
  const { data: user } = useQuery(sessionQuery);
  const isAdmin = !!user?.roles.includes("admin");
  const canEditOperatorNames = isAdmin || !!user?.roles.includes("qa_lead");
  const members = useMembers();
  const [editing, setEditing] = useState<Member | null>(null);
  const [toggling, setToggling] = useState<Member | null>(null);
  const [naming, setNaming] = useState<Member | null>(null);

  const list = [...(members.data?.members ?? [])].sort((a, b) => Number(b.active) - Number(a.active) || a.name.localeCompare(b.name));
  const activeCount = list.filter((m) => m.active).length;

  return (
    <div className="space-y-8">
      <PageHeader
        eyebrow="Setup"
        title="People"
        description={
          isAdmin
            ? "Members of the program, their roles and pending invitations."
            : "Members of the program and their roles. Only administrators can change roles; you can record the DICOM operator names of clinicians."
        }
      />
      <section aria-labelledby="members-heading">
        <div className="mb-3 flex flex-wrap items-baseline gap-x-3">
          <h2 id="members-heading" className="text-lg font-semibold text-ink-950">
            Members
          </h2>
          {members.data ? (
            <span className="text-sm tabular-nums text-slate-600">
              {activeCount} active{list.length > activeCount ? `, ${list.length - activeCount} deactivated` : ""}
            </span>
          ) : null}
        </div>
        {members.isPending ? (
          <LoadingState label="Loading members…" />
        ) : members.isError ? (
          <ErrorState error={members.error} onRetry={() => void members.refetch()} retrying={members.isFetching} />
        ) : list.length === 0 ? (
          <EmptyState title="No members yet">{isAdmin ? "Invite the first people below." : "No one has joined this program yet."}</EmptyState>
        ) : (
          <MembersTable
            members={list}
            currentUserId={user?.id ?? ""}
            canManage={isAdmin}
            canEditOperatorNames={canEditOperatorNames}
            onEditOperatorNames={setNaming}
            onEditRoles={setEditing}
            onToggleActive={setToggling}
          />
        )}
      </section>
      <OperatorNamesDialog member={naming} onClose={() => setNaming(null)} />
      {isAdmin ? (
        <>
          <InviteForm />
          <InvitationsList />
          <EditRolesDialog member={editing} onClose={() => setEditing(null)} />
          <MemberActiveDialog member={toggling} onClose={() => setToggling(null)} />
        </>
      ) : null}
    </div>
  );
}
