// Reviewer agreement from double reads. PostgreSQL does the heavy part — it pairs each
// exam's first and second read and counts value pairs per criterion (GROUP BY), so only
// small contingency tables reach Node — and the shared statistics module does the rest on
// matrices expanded from those counts (exactly the same numbers as on the raw rows).
import type { Knex } from "knex";
import type { Db } from "../db/knex";
import { cohensKappa, gwetAC1, krippendorffAlpha, percentAgreement, agreementBand, type RatingsMatrix } from "../../shared/stats/index";
import type { Criterion } from "../../shared/rubric/types";
import { FINDING_READS } from "../../shared/catalogue";

export interface AgreementFilters {
  programId: string;
  from?: string;
  to?: string;
  application?: string;
}

/** The pairs of reads (first, second) of double-read exams in range, as a subquery. */
export function readPairs(db: Db | Knex.Transaction, f: AgreementFilters) {
  const q = db("reviews as p")
    .join("assignments as pa", function () {
      this.on("pa.id", "=", "p.assignment_id").andOnVal("pa.kind", "=", "primary");
    })
    .join("reviews as s", "s.exam_id", "p.exam_id")
    .join("assignments as sa", function () {
      this.on("sa.id", "=", "s.assignment_id").andOnVal("sa.kind", "=", "second");
    })
    .join("exams as e", "e.id", "p.exam_id")
    .join("applications as ap", "ap.id", "e.application_id")
    .where("p.program_id", f.programId);
  if (f.from) q.andWhere("e.performed_at", ">=", f.from);
  if (f.to) q.andWhere("e.performed_at", "<", db.raw(`?::date + 1`, [f.to]));
  if (f.application) q.andWhere("ap.code", f.application);
  return q;
}

export interface PairCount {
  key: string;
  a: string | null;
  b: string | null;
  n: number;
}

/** Counts of (first value, second value) per criterion key, and per finding for `read`. */
export async function pairCounts(db: Db, f: AgreementFilters): Promise<PairCount[]> {
  const scores = await readPairs(db, f)
    .crossJoin(db.raw("LATERAL jsonb_each_text(p.scores) AS k(key, value)"))
    .groupBy("k.key", "k.value", db.raw("s.scores->>k.key"))
    .select("k.key", "k.value as a", db.raw("s.scores->>k.key as b"), db.raw("count(*)::int as n"));
  const reads = await readPairs(db, f)
    .crossJoin(db.raw("LATERAL jsonb_array_elements(p.reads) AS r(item)"))
    .joinRaw("LEFT JOIN LATERAL (SELECT x->>'read' AS read FROM jsonb_array_elements(s.reads) x WHERE x->>'key' = r.item->>'key') sr ON true")
    .groupByRaw("r.item->>'read', sr.read")
    .select(db.raw("'read' as key"), db.raw("r.item->>'read' as a"), "sr.read as b", db.raw("count(*)::int as n"));
  return [...scores, ...reads] as PairCount[];
}

/** Expands counted pairs into a two-column ratings matrix (one row per read pair). */
export function expand(counts: { a: string | null; b: string | null; n: number }[], toRating: (v: string | null) => string | number | null): RatingsMatrix {
  const rows: (string | number | null)[][] = [];
  for (const c of counts) for (let i = 0; i < c.n; i++) rows.push([toRating(c.a), toRating(c.b)]);
  return rows;
}

export interface CriterionAgreement {
  key: string;
  label: string;
  kind: string;
  units: number;
  percentAgreement: number | null;
  kappa: { value: number | null; ci95: [number, number] | null; weights: "quadratic" | "unweighted" };
  alpha: { value: number | null; level: "ordinal" | "nominal" | "interval" };
  ac1: { value: number | null; ci95: [number, number] | null };
  band: string | null;
}

/** Ordinal levels become their rank so weighted kappa and ordinal alpha see the order. */
export function ratingOf(c: Criterion | undefined) {
  if (!c) return (v: string | null) => v;
  if (c.kind === "number") return (v: string | null) => (v === null ? null : Number(v));
  if (c.kind === "ordinal")
    return (v: string | null) => (v === null ? null : c.levels.findIndex((l) => l.value === v) >= 0 ? c.levels.findIndex((l) => l.value === v) : null);
  return (v: string | null) => (v === null || !c.levels.some((l) => l.value === v) ? null : v);
}

/** The agreement statistics of one criterion's read pairs. */
export function agreementOf(c: Criterion | { key: "read"; label: string; kind: "choice" }, counts: PairCount[]): CriterionAgreement {
  const crit = "levels" in c ? c : undefined;
  const matrix = expand(counts, ratingOf(crit));
  const complete = matrix.filter((r) => r[0] !== null && r[1] !== null);
  const ordinal = crit?.kind === "ordinal";
  const numeric = crit?.kind === "number";
  const categories = ordinal
    ? crit!.levels.map((_, i) => i)
    : crit && !numeric
      ? crit.levels.map((l) => l.value)
      : c.key === "read"
        ? [...FINDING_READS]
        : undefined;
  const kappa = complete.length ? cohensKappa(complete, { weights: ordinal || numeric ? "quadratic" : "unweighted", categories }) : null;
  const alphaLevel = numeric ? "interval" : ordinal ? "ordinal" : "nominal";
  const alpha = matrix.length ? krippendorffAlpha(matrix, { level: alphaLevel }) : null;
  const ac1 = complete.length && !numeric ? gwetAC1(complete, { categories }) : null;
  const pa = complete.length ? percentAgreement(complete) : null;
  return {
    key: c.key,
    label: c.label,
    kind: c.kind,
    units: complete.length,
    percentAgreement: pa?.value ?? null,
    kappa: { value: kappa?.value ?? null, ci95: kappa?.ci95 ?? null, weights: ordinal || numeric ? "quadratic" : "unweighted" },
    alpha: { value: alpha?.value ?? null, level: alphaLevel },
    ac1: { value: ac1?.value ?? null, ci95: ac1?.ci95 ?? null },
    band: kappa?.value === null || kappa?.value === undefined ? null : agreementBand(kappa.value),
  };
}
