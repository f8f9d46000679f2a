// One role's part of the home page: its counts, each linking to where the work is.
// When nothing waits, it says so in words rather than showing a wall of zeros alone.
import { Link } from "react-router-dom";
import { ChevronRight } from "lucide-react";
import { ROLE_LABELS } from "../../../../shared/roles";
import type { Home } from "../../../../shared/schemas/home";
import { formatCount } from "../../../lib/stat-format";

type Section = Home["sections"][number];
type Card = Section["cards"][number];

function CardBody({ card }: { card: Card }) {
  return (
    <>
      <span className={`block text-3xl font-semibold tabular-nums ${card.count === 0 ? "text-slate-600" : "text-ink-950"}`}>{formatCount(card.count)}</span>
      <span className="mt-1 block font-semibold text-ink-900">{card.label}</span>
      {card.hint ? <span className="mt-1 block text-sm text-slate-600">{card.hint}</span> : null}
    </>
  );
}

function HomeCard({ card }: { card: Card }) {
  const box = "block h-full rounded-lg border border-slate-200 bg-white p-4";
  if (!card.href) {
    return (
      <li className={box}>
        <CardBody card={card} />
      </li>
    );
  }
  return (
    <li>
      <Link to={card.href} className={`${box} group relative transition-colors hover:border-sea-400 hover:bg-sea-50`}>
        <CardBody card={card} />
        <ChevronRight aria-hidden="true" className="absolute right-3 top-4 size-4 text-slate-500 group-hover:text-sea-700" />
      </Link>
    </li>
  );
}

export function HomeSection({ section }: { section: Section }) {
  const headingId = `home-${section.role}`;
  const nothingWaiting = section.cards.every((c) => c.count === 0);
  return (
    <section aria-labelledby={headingId} className="mb-8">
      <div className="mb-3 flex flex-wrap items-center gap-x-3 gap-y-1">
        <h2 id={headingId} className="text-lg font-semibold text-ink-950">
          {section.title}
        </h2>
        <span className="rounded-full bg-sand-100 px-2 py-0.5 text-xs font-semibold text-sand-800">{ROLE_LABELS[section.role]}</span>
      </div>
      {nothingWaiting ? (
        <p className="mb-3 rounded-md border border-slate-200 bg-paper-200 px-4 py-3 text-sm text-slate-700">Nothing is waiting for you here right now.</p>
      ) : null}
      {section.cards.length > 0 ? (
        <ul className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
          {section.cards.map((card) => (
            <HomeCard key={card.key} card={card} />
          ))}
        </ul>
      ) : null}
    </section>
  );
}
