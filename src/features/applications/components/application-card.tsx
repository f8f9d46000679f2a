// One application of the catalogue as it is in use: its version, transducers, presets,
// typical depth, orientation convention, views (required or not), findings and cautions.
import { Link } from "react-router-dom";
import type { Application } from "../../../../shared/schemas/applications";
import { StatusTag } from "../../../components/ui/status-tag";
import { ORIENTATION_LABELS, TRANSDUCER_LABELS } from "../../../lib/catalogue";

function LabelList({ items }: { items: { key: string; label: string; required?: boolean }[] }) {
  if (items.length === 0) return <p className="text-sm text-slate-600">None listed</p>;
  return (
    <ul className="flex flex-wrap gap-1.5">
      {items.map((item) => (
        <li key={item.key} className="rounded bg-paper-200 px-2 py-0.5 text-sm text-ink-900">
          {item.label}
          {item.required === false ? <span className="text-slate-600"> (optional)</span> : null}
        </li>
      ))}
    </ul>
  );
}

export function ApplicationCard({ application, mayEdit }: { application: Application; mayEdit: boolean }) {
  const [min, max] = application.typicalDepthCm;
  const headingId = `app-${application.id}`;
  return (
    <article aria-labelledby={headingId} className="rounded-lg border border-slate-200 bg-white p-5">
      <header className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id={headingId} className="text-lg font-semibold text-ink-950">
          {application.name}
        </h2>
        <div className="flex items-center gap-2">
          <code className="rounded bg-slate-100 px-1.5 py-0.5 text-sm text-slate-700">{application.code}</code>
          <span className="text-sm tabular-nums text-slate-700">version {application.version}</span>
          {application.active ? null : <StatusTag tone="off">Inactive</StatusTag>}
          <Link
            to={`/setup/applications/${application.id}`}
            aria-label={`${mayEdit ? "Edit" : "Open"} ${application.name}`}
            className="rounded-md px-2 py-1 text-sm font-semibold text-sea-700 hover:bg-sea-50"
          >
            {mayEdit ? "Edit" : "Open"}
          </Link>
        </div>
      </header>
      <dl className="mt-4 grid gap-4 sm:grid-cols-[10rem_1fr]">
        <dt className="text-sm font-semibold text-slate-700">Usual transducers</dt>
        <dd className="text-sm text-ink-900">{application.usualTransducers.map((t) => TRANSDUCER_LABELS[t] ?? t).join(", ") || "—"}</dd>
        <dt className="text-sm font-semibold text-slate-700">Presets</dt>
        <dd className="text-sm text-ink-900">{application.presets.join(", ") || "—"}</dd>
        <dt className="text-sm font-semibold text-slate-700">Typical depth</dt>
        <dd className="text-sm tabular-nums text-ink-900">{min === max ? `${min} cm` : `${min}–${max} cm`}</dd>
        <dt className="text-sm font-semibold text-slate-700">Orientation</dt>
        <dd className="text-sm text-ink-900">{ORIENTATION_LABELS[application.orientation]}</dd>
        <dt className="text-sm font-semibold text-slate-700">Views</dt>
        <dd>
          <LabelList items={application.views} />
        </dd>
        <dt className="text-sm font-semibold text-slate-700">Findings</dt>
        <dd>
          <LabelList items={application.findings} />
        </dd>
        {application.cautions.length > 0 ? (
          <>
            <dt className="text-sm font-semibold text-slate-700">Cautions</dt>
            <dd>
              <ul className="list-disc space-y-0.5 pl-5 text-sm text-ink-900">
                {application.cautions.map((c) => (
                  <li key={c}>{c}</li>
                ))}
              </ul>
            </dd>
          </>
        ) : null}
      </dl>
    </article>
  );
}
