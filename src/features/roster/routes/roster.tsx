// Oversight → Roster: every sonographer of the program with progress toward credentialing
// per application, totals, last activity and flags that need the QA lead's attention.
// Search and the flag filter live in the URL, so a link reproduces the view.
import { useQuery } from "@tanstack/react-query";
import { Link } from "react-router-dom";
import { ROSTER_FLAG_LABELS, ROSTER_FLAGS, type RosterFlag, type RosterRow } from "../../../../shared/schemas/progress";
import { buttonClasses } from "../../../components/ui/button";
import { PageHeader } from "../../../components/ui/page-header";
import { SelectField } from "../../../components/ui/select-field";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { TextField } from "../../../components/ui/text-field";
import { isoDay } from "../../../lib/date-range";
import { useSearchState } from "../../../lib/use-search-state";
import { rosterQuery } from "../api/roster";
import { RosterTable } from "../components/roster-table";

type FlagFilter = "" | "any" | "none" | RosterFlag;

const isFlagFilter = (v: string | null): v is FlagFilter => v === "" || v === "any" || v === "none" || (ROSTER_FLAGS as readonly string[]).includes(v ?? "");

function matches(r: RosterRow, search: string, flag: FlagFilter): boolean {
  const q = search.trim().toLowerCase();
  if (q && !r.name.toLowerCase().includes(q) && !r.email.toLowerCase().includes(q)) return false;
  if (flag === "any") return r.flags.length > 0;
  if (flag === "none") return r.flags.length === 0;
  if (flag) return r.flags.includes(flag);
  return true;
}

export default function RosterPage() {
  const [params, update] = useSearchState();
  const search = params.get("q") ?? "";
  const rawFlag = params.get("flag");
  const flag: FlagFilter = isFlagFilter(rawFlag) ? rawFlag : "";
  const roster = useQuery(rosterQuery);
  const set = (k: "q" | "flag", v: string) => update({ [k]: v });
  const rows = roster.data?.filter((r) => matches(r, search, flag)) ?? [];
  const flagged = roster.data?.filter((r) => r.flags.length > 0).length ?? 0;

  return (
    <div>
      <PageHeader
        eyebrow="Oversight"
        title="Roster"
        description="Every clinician's progress toward credentialing: credited exams against each application's threshold, the learning-curve signal, and flags that may need a word from you."
        actions={
          <Link to="/oversight/reports" className={buttonClasses("secondary", "sm")}>
            Credentialing reports
          </Link>
        }
      />
      <form
        role="search"
        aria-label="Filter the roster"
        onSubmit={(e) => e.preventDefault()}
        className="mb-6 flex flex-wrap items-end gap-3 rounded-lg border border-slate-200 bg-white p-4"
      >
        <TextField label="Search by name or e-mail" type="search" className="w-72" value={search} onChange={(e) => set("q", e.target.value)} />
        <SelectField label="Flag" className="w-80" value={flag} onChange={(e) => set("flag", e.target.value)}>
          <option value="">Everyone</option>
          <option value="any">Any flag{roster.data ? ` (${flagged})` : ""}</option>
          <option value="none">No flag</option>
          {ROSTER_FLAGS.map((f) => (
            <option key={f} value={f}>
              {ROSTER_FLAG_LABELS[f]}
              {roster.data ? ` (${roster.data.filter((r) => r.flags.includes(f)).length})` : ""}
            </option>
          ))}
        </SelectField>
      </form>
      {roster.isError ? (
        <ErrorState error={roster.error} onRetry={() => void roster.refetch()} retrying={roster.isFetching} />
      ) : !roster.data ? (
        <LoadingState label="Loading the roster…" />
      ) : roster.data.length === 0 ? (
        <EmptyState title="No clinician in this program yet">People with the clinician role appear here once they are added under Setup → People.</EmptyState>
      ) : rows.length === 0 ? (
        <EmptyState
          title="No clinician matches these filters"
          action={
            <button type="button" className={buttonClasses("secondary", "sm")} onClick={() => update({ q: null, flag: null })}>
              Clear the filters
            </button>
          }
        >
          {roster.data.length} clinician{roster.data.length === 1 ? "" : "s"} in all.
        </EmptyState>
      ) : (
        <RosterTable rows={rows} filename={`roster_${isoDay(new Date())}.csv`} />
      )}
    </div>
  );
}
