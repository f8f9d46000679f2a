// One application of the catalogue: its transducers, typical depth, views and findings.
import type { Application } from "../../../../shared/schemas/applications";
import { StatusTag } from "../../../components/ui/status-tag";
import { TRANSDUCER_LABELS } from "../../../lib/catalogue";

function LabelList({ items }: { items: { key: string; label: string }[] }) {
  if (items.length === 0) return <p className="text-sm text-slate-600">None listed</p>;
  return (
    <ul className="flex flex-wrap gap-1.5">
      {items.map((item) => (
        <li key={item.key} className="rounded bg-paper-200 px-2 py-0.5 text-sm text-ink-900">
          {item.label}
        </li>
      ))}
    </ul>
  );
}

export function ApplicationCard({ application }: { application: Application }) {
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
          {application.active ? null : <StatusTag tone="off">Inactive</StatusTag>}
        </div>
      </header>
      <dl className="mt-4 grid gap-4 sm:grid-cols-[10rem_1fr]">
        <dt className="text-sm font-semibold text-slate-700">Usual transducers</dt>
        <dd className="text-sm text-ink-900">{application.usualTransducers.map((t) => TRANSDUCER_LABELS[t] ?? t).join(", ") || "—"}</dd>
        <dt className="text-sm font-semibold text-slate-700">Typical depth</dt>
        <dd className="text-sm tabular-nums text-ink-900">{min === max ? `${min} cm` : `${min}–${max} cm`}</dd>
        <dt className="text-sm font-semibold text-slate-700">Standard views</dt>
        <dd>
          <LabelList items={application.views} />
        </dd>
        <dt className="text-sm font-semibold text-slate-700">Findings</dt>
        <dd>
          <LabelList items={application.findings} />
        </dd>
      </dl>
    </article>
  );
}
