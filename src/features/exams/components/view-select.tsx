// The view label of one clip, saved as soon as it is chosen.
import type { Clip } from "../../../../shared/schemas/exams";
import { SelectField } from "../../../components/ui/select-field";
import { useUpdateClip } from "../api/exams";

type Props = {
  examId: string;
  clip: Clip;
  views: { key: string; label: string }[];
  disabled?: boolean;
};

export function ViewSelect({ examId, clip, views, disabled }: Props) {
  const update = useUpdateClip(examId);
  const known = views.some((v) => v.key === clip.view);
  return (
    <SelectField
      label={
        <>
          View<span className="sr-only"> of {clip.originalName || "clip"}</span>
        </>
      }
      compact
      value={clip.view ?? ""}
      disabled={disabled || update.isPending}
      error={update.isError ? update.error.message : undefined}
      onChange={(e) => update.mutate({ clipId: clip.id, body: { view: e.target.value || null } })}
    >
      <option value="">No view chosen</option>
      {views.map((v) => (
        <option key={v.key} value={v.key}>
          {v.label}
        </option>
      ))}
      {clip.view && !known ? <option value={clip.view}>{clip.view}</option> : null}
    </SelectField>
  );
}
