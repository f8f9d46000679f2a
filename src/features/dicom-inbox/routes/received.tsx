// Received studies: what ultrasound machines sent to the program's DICOM address, de-identified
// on arrival and grouped by study. A clinician sees the studies their operator name matched and
// those that matched nobody; they claim one by hand or make a draft exam of it in one step.
// QA leads and admins see every open study, to help sort them out.
import { Link, useSearchParams } from "react-router-dom";
import { useQuery } from "@tanstack/react-query";
import { PageHeader } from "../../../components/ui/page-header";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { StatusTag } from "../../../components/ui/status-tag";
import { Button, buttonClasses } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { formatDateTime } from "../../../lib/format";
import { dicomLine } from "../../../lib/dicom";
import { errorMessage } from "../../../lib/api-errors";
import { sessionQuery } from "../../../lib/session";
import { inboxQuery, previewUrl, useClaimStudy, type InboxStudy } from "../api/inbox";
import { StudyPreview } from "../components/study-preview";

function Owner({ study, me }: { study: InboxStudy; me: string | undefined }) {
  if (study.claimedBy) return <StatusTag tone="good">{study.claimedBy.id === me ? "Claimed by you" : `Claimed by ${study.claimedBy.name}`}</StatusTag>;
  if (study.matchedTo) return <StatusTag tone="good">{study.matchedTo.id === me ? "Matched to you" : `Matched to ${study.matchedTo.name}`}</StatusTag>;
  return <StatusTag tone="waiting">Unassigned</StatusTag>;
}

export default function ReceivedStudiesPage() {
  const { data: user } = useQuery(sessionQuery);
  const isClinician = !!user?.roles.includes("sonographer");
  const list = useQuery(inboxQuery);
  const claim = useClaimStudy();
  const [params, setParams] = useSearchParams();
  const selectedId = params.get("study");
  const studies = list.data ?? [];
  const selected = studies.find((s) => s.id === selectedId) ?? null;

  return (
    <div className="space-y-6">
      <PageHeader
        eyebrow="Scanning"
        title="Received studies"
        description={
          <>
            Studies your ultrasound machine sent to the program&apos;s DICOM address. A study matched to you by the operator name on the machine is yours; one
            that matched no one can be claimed. Make an exam of a study to add its clips to a draft.
          </>
        }
      />
      <FormMessage message={claim.isError ? errorMessage(claim.error, "The study could not be claimed.") : null} />
      {list.isPending ? (
        <LoadingState label="Loading received studies…" />
      ) : list.isError ? (
        <ErrorState error={list.error} onRetry={() => void list.refetch()} retrying={list.isFetching} />
      ) : studies.length === 0 ? (
        <EmptyState title="Nothing received">
          Studies appear here when a machine sends them to this program&apos;s DICOM address. Ask your QA lead for the AE title and to record the operator name
          your machine uses.
        </EmptyState>
      ) : (
        <div className="overflow-x-auto rounded-lg border border-slate-200 bg-white">
          <table className="w-full text-left text-sm">
            <caption className="sr-only">Received studies not yet made into exams</caption>
            <thead className="border-b border-slate-200 bg-paper-200 text-xs uppercase tracking-wide text-slate-700">
              <tr>
                {["Preview", "Received", "Sent by", "Objects", "Whose", ""].map((h, i) => (
                  <th key={i} scope="col" className="px-3 py-2 font-semibold">
                    {h || <span className="sr-only">Actions</span>}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody className="divide-y divide-slate-100">
              {studies.map((s) => {
                const first = s.objects[0];
                const mine = s.claimedBy?.id === user?.id || (!s.claimedBy && s.matchedTo?.id === user?.id);
                const open = !s.claimedBy && !s.matchedTo;
                return (
                  <tr key={s.id} className={s.id === selected?.id ? "bg-sea-50 align-top" : "align-top"}>
                    <td className="px-3 py-2">
                      {first?.hasPreview ? (
                        <img src={previewUrl(s.id, first.id)} alt="" loading="lazy" className="h-14 w-20 rounded-sm bg-black object-contain" />
                      ) : (
                        <span className="block h-14 w-20 rounded-sm bg-slate-100" />
                      )}
                    </td>
                    <td className="whitespace-nowrap px-3 py-2 tabular-nums text-ink-900">
                      {formatDateTime(s.receivedAt)}
                      {s.lastReceivedAt !== s.receivedAt ? <span className="block text-xs text-slate-600">last {formatDateTime(s.lastReceivedAt)}</span> : null}
                    </td>
                    <td className="px-3 py-2 font-mono text-ink-900">{s.callingAe}</td>
                    <td className="px-3 py-2 text-ink-900">
                      {s.objects.length} {s.objects.length === 1 ? "object" : "objects"}
                      {first ? <span className="block text-xs text-slate-600">{dicomLine(first.facts)}</span> : null}
                    </td>
                    <td className="px-3 py-2">
                      <Owner study={s} me={user?.id} />
                    </td>
                    <td className="whitespace-nowrap px-3 py-2 text-right">
                      <div className="flex justify-end gap-1">
                        <Button
                          size="sm"
                          variant="ghost"
                          aria-pressed={s.id === selected?.id}
                          aria-label={`Preview the study received ${formatDateTime(s.receivedAt)}`}
                          onClick={() => setParams(s.id === selected?.id ? new URLSearchParams() : new URLSearchParams({ study: s.id }), { replace: true })}
                        >
                          Preview
                        </Button>
                        {isClinician && open ? (
                          <Button
                            size="sm"
                            variant="secondary"
                            busy={claim.isPending && claim.variables === s.id}
                            onClick={() => claim.mutate(s.id)}
                            aria-label={`Claim the study received ${formatDateTime(s.receivedAt)}`}
                          >
                            Claim
                          </Button>
                        ) : null}
                        {isClinician && (mine || open) ? (
                          <Link to={`/received/${s.id}/exam`} className={buttonClasses("primary", "sm")}>
                            Make exam
                          </Link>
                        ) : null}
                      </div>
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      )}
      {selected ? <StudyPreview study={selected} /> : null}
    </div>
  );
}
