// The filters above My exams. Each change goes straight into the address (search params),
// so a filtered view can be bookmarked, shared and restored with Back.
import type { Application } from "../../../../shared/schemas/applications";
import { Button } from "../../../components/ui/button";
import { SelectField } from "../../../components/ui/select-field";
import { TextField } from "../../../components/ui/text-field";
import type { ExamListFilters } from "../api/exams";

type Props = {
  filters: ExamListFilters;
  applications: Application[];
  onChange: (change: Partial<ExamListFilters>) => void;
  onClear: () => void;
};

export function ExamListFilters({ filters, applications, onChange, onClear }: Props) {
  const any = !!(filters.status || filters.application || filters.from || filters.to);
  return (
    <form
      role="search"
      aria-label="Filter exams"
      onSubmit={(e) => e.preventDefault()}
      className="mb-4 flex flex-wrap items-end gap-3 rounded-lg border border-slate-200 bg-white p-4"
    >
      <SelectField
        label="Status"
        compact
        className="w-36"
        value={filters.status ?? ""}
        onChange={(e) => onChange({ status: (e.target.value || undefined) as ExamListFilters["status"] })}
      >
        <option value="">All</option>
        <option value="draft">Draft</option>
        <option value="submitted">Submitted, waiting for review</option>
        <option value="reviewed">Reviewed</option>
      </SelectField>
      <SelectField
        label="Application"
        compact
        className="w-56"
        value={filters.application ?? ""}
        onChange={(e) => onChange({ application: e.target.value || undefined })}
      >
        <option value="">All applications</option>
        {applications.map((a) => (
          <option key={a.code} value={a.code}>
            {a.name}
          </option>
        ))}
      </SelectField>
      <TextField
        label="Performed from"
        type="date"
        className="w-44 [&_input]:py-1 [&_input]:text-sm"
        value={filters.from ?? ""}
        max={filters.to}
        onChange={(e) => onChange({ from: e.target.value || undefined })}
      />
      <TextField
        label="Performed to"
        type="date"
        className="w-44 [&_input]:py-1 [&_input]:text-sm"
        value={filters.to ?? ""}
        min={filters.from}
        onChange={(e) => onChange({ to: e.target.value || undefined })}
      />
      {any ? (
        <Button variant="ghost" size="sm" onClick={onClear}>
          Clear filters
        </Button>
      ) : null}
    </form>
  );
}
