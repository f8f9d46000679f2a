// One received study up close: every object's preview (its middle frame, made on the server
// from the de-identified object) with what the object said about its acquisition.
import { ImageOff, TriangleAlert } from "lucide-react";
import { dicomFacts } from "../../../lib/dicom";
import { formatBytes } from "../../../lib/bytes";
import { previewUrl, type InboxStudy } from "../api/inbox";

export function StudyPreview({ study }: { study: InboxStudy }) {
  const burnedIn = study.objects.some((o) => o.facts.burnedInAnnotation === true);
  return (
    <section aria-labelledby={`preview-${study.id}`} className="rounded-lg border border-slate-200 bg-white p-4">
      <h2 id={`preview-${study.id}`} className="text-base font-semibold text-ink-950">
        Preview of the study from {study.callingAe}
      </h2>
      <p className="mt-1 text-sm text-slate-600">
        De-identified on arrival: names, identifiers and dates of the patient are gone, and the study has new UIDs. Text burned into the pixels is not removed
        by that.
      </p>
      {burnedIn ? (
        <p role="note" className="mt-2 flex items-start gap-2 rounded-md bg-sand-50 px-3 py-2 text-sm text-sand-900 ring-1 ring-sand-200">
          <TriangleAlert aria-hidden="true" className="mt-0.5 size-4 shrink-0" />
          The machine marked text as burned into these images. After making the exam, black it out on each clip (Redact) before you submit.
        </p>
      ) : null}
      <ul className="mt-3 grid gap-3 sm:grid-cols-2 lg:grid-cols-3" aria-label="Objects of this study">
        {study.objects.map((o, i) => (
          <li key={o.id} className="overflow-hidden rounded-md border border-slate-200">
            {o.hasPreview ? (
              <img src={previewUrl(study.id, o.id)} alt={`Object ${i + 1}, middle frame`} className="aspect-[4/3] w-full bg-black object-contain" />
            ) : (
              <div className="flex aspect-[4/3] w-full items-center justify-center bg-slate-100 text-sm text-slate-600">
                <ImageOff aria-hidden="true" className="mr-1.5 size-4" /> No preview
              </div>
            )}
            <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 px-3 py-2 text-xs">
              <dt className="text-slate-600">Object</dt>
              <dd className="text-ink-900">
                {i + 1} of {study.objects.length}, {formatBytes(o.sizeBytes)}
              </dd>
              {dicomFacts(o.facts).map(([label, value]) => (
                <div key={label} className="contents">
                  <dt className="text-slate-600">{label}</dt>
                  <dd className="text-ink-900">{value}</dd>
                </div>
              ))}
            </dl>
          </li>
        ))}
      </ul>
    </section>
  );
}
