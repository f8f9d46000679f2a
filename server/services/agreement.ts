// Reviewer agreement from double reads. PostgreSQL does the heavy part — it pairs each
// exam's first and second read and, in one pass, counts value pairs per criterion (and per
// finding read) and per pair of reviewers (GROUP BY), so only small contingency tables
// reach Node. The shared statistics module takes those counts as rows with
// multiplicities, which gives exactly the figures of the same module on the raw rows.
import type { Knex } from "knex";
import type { Db } from "../db/knex";
import { cohensKappa, gwetAC1, krippendorffAlpha, percentAgreement, agreementBand, type Interval, type Rating } from "../../shared/stats/index";
import type { Criterion } from "../../shared/rubric/types";
import { FINDING_READS } from "../../shared/catalogue";

export interface AgreementFilters {
  programId: string;
  from?: string;
  to?: string;
  application?: string;
}

/**
 * The pairs of reads (first, second) of double-read exams in range, as a subquery. The
 * exam and its application are joined when a filter needs them or `exam` is not false
 * (both are NOT NULL foreign keys, so leaving them out changes no count).
 */
export function readPairs(db: Db | Knex.Transaction, f: AgreementFilters, opts: { exam?: boolean } = {}) {
  const withExam = opts.exam !== false;
  const q = db("reviews as p")
    .join("assignments as pa", function () {
      this.on("pa.id", "=", "p.assignment_id").andOnVal("pa.kind", "=", "primary");
    })
    .join("reviews as s", "s.exam_id", "p.exam_id")
    .join("assignments as sa", function () {
      this.on("sa.id", "=", "s.assignment_id").andOnVal("sa.kind", "=", "second");
    });
  const exam = withExam || f.from || f.to || f.application;
  if (exam) q.join("exams as e", "e.id", "p.exam_id");
  if (withExam || f.application) q.join("applications as ap", "ap.id", "e.application_id");
  q.where("p.program_id", f.programId);
  // Same program as the review, said again for the exam so that PostgreSQL can walk the
  // exams' (program_id, performed_at) index for date ranges and newest-first lists.
  if (exam) q.andWhere("e.program_id", f.programId);
  if (f.from) q.andWhere("e.performed_at", ">=", f.from);
  if (f.to) q.andWhere("e.performed_at", "<", db.raw(`?::date + 1`, [f.to]));
  if (f.application) q.andWhere("ap.code", f.application);
  return q;
}

/** How many read pairs had first value `a` and second value `b` for criterion `key`, read first by `ra` and second by `rb`. */
export interface PairCount {
  key: string;
  a: string | null;
  b: string | null;
  ra: string;
  rb: string;
  n: number;
}

/**
 * Counts of (first value, second value) per criterion key, and per finding under the key
 * `read`, split by (first reviewer, second reviewer) — one query, one pass over the pairs.
 */
export async function pairCounts(db: Db, f: AgreementFilters): Promise<PairCount[]> {
  return db.transaction(async (trx) => {
    // Settings for this one aggregate (measured on the bench program, 2 cores): its cost
    // estimate makes PostgreSQL compile it with JIT, which took longer (~0.5 s) than running
    // it; parallel workers spent more CPU in all and answered later whenever other work ran
    // (median 600 against 450 ms); and the pairing's hash tables spill to disk at the
    // default work_mem.
    await trx.raw("SET LOCAL jit = off");
    await trx.raw("SET LOCAL max_parallel_workers_per_gather = 0");
    await trx.raw("SET LOCAL work_mem = '32MB'");
    // Pairs first grouped by their whole score and read documents (reviews of one rubric
    // repeat a few patterns), then each pattern's values taken apart once and counted.
    const patterns = readPairs(trx, f, { exam: false })
      .groupBy("p.scores", "s.scores", "p.reads", "s.reads", "p.reviewer_id", "s.reviewer_id")
      .select("p.scores as ps", "s.scores as ss", "p.reads as pr", "s.reads as sr", "p.reviewer_id as ra", "s.reviewer_id as rb", trx.raw("count(*) as n"));
    return trx
      .from(patterns.as("g"))
      .joinRaw(
        `CROSS JOIN LATERAL (
           SELECT k.key, k.value, g.ss->>k.key FROM jsonb_each_text(g.ps) AS k(key, value)
           UNION ALL
           SELECT 'read', r.item->>'read', sr.read FROM jsonb_array_elements(g.pr) AS r(item)
             LEFT JOIN LATERAL (SELECT x->>'read' AS read FROM jsonb_array_elements(g.sr) x WHERE x->>'key' = r.item->>'key') sr ON true
         ) AS v(key, a, b)`,
      )
      .groupBy("v.key", "v.a", "v.b", "g.ra", "g.rb")
      .select("v.key", "v.a", "v.b", "g.ra", "g.rb", trx.raw("sum(g.n)::int as n")) as Promise<PairCount[]>;
  });
}

/** Counted pairs as a two-column ratings matrix with one row per distinct pair and its count as multiplicity. */
export function countedRows(
  counts: readonly { a: string | null; b: string | null; n: number }[],
  toRating: (v: string | null) => string | number | null,
  opts: { complete?: boolean } = {},
): { rows: Rating[][]; multiplicity: number[]; units: number } {
  const rows: Rating[][] = [];
  const multiplicity: number[] = [];
  let units = 0;
  for (const c of counts) {
    const a = toRating(c.a);
    const b = toRating(c.b);
    if (opts.complete && (a === null || b === null)) continue;
    rows.push([a, b]);
    multiplicity.push(c.n);
    units += c.n;
  }
  return { rows, multiplicity, units };
}

/** Alpha's percentile bootstrap in the report: resamples and seed, fixed so a report is reproducible. */
export const ALPHA_BOOTSTRAP = { samples: 1000, seed: 20261201 } as const;

export interface CriterionAgreement {
  key: string;
  label: string;
  kind: string;
  units: number;
  percentAgreement: number | null;
  kappa: { value: number | null; ci95: [number, number] | null; weights: "quadratic" | "unweighted" };
  alpha: {
    value: number | null;
    level: "ordinal" | "nominal" | "interval";
    /** Percentile bootstrap over exams (ALPHA_BOOTSTRAP); null when alpha or the interval is not computable. */
    ci95: Interval | null;
    bootstrap: { samples: number; seed: number; used: number } | null;
  };
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

/** The agreement statistics of one criterion's counted read pairs. */
export function agreementOf(
  c: Criterion | { key: "read"; label: string; kind: "choice" },
  counts: readonly { a: string | null; b: string | null; n: number }[],
): CriterionAgreement {
  const crit = "levels" in c ? c : undefined;
  const toRating = ratingOf(crit);
  const all = countedRows(counts, toRating);
  const complete = countedRows(counts, toRating, { complete: true });
  const ordinal = crit?.kind === "ordinal";
  const numeric = crit?.kind === "number";
  const categories = ordinal
    ? crit!.levels.map((_, i) => i)
    : crit && !numeric
      ? crit.levels.map((l) => l.value)
      : c.key === "read"
        ? [...FINDING_READS]
        : undefined;
  const weights = ordinal || numeric ? "quadratic" : "unweighted";
  const some = complete.units > 0;
  const kappa = some ? cohensKappa(complete.rows, { weights, categories, multiplicity: complete.multiplicity }) : null;
  const alphaLevel = numeric ? "interval" : ordinal ? "ordinal" : "nominal";
  const alpha = all.units > 0 ? krippendorffAlpha(all.rows, { level: alphaLevel, multiplicity: all.multiplicity, bootstrap: ALPHA_BOOTSTRAP }) : null;
  const ac1 = some && !numeric ? gwetAC1(complete.rows, { categories, multiplicity: complete.multiplicity }) : null;
  const pa = some ? percentAgreement(complete.rows, { multiplicity: complete.multiplicity }) : null;
  return {
    key: c.key,
    label: c.label,
    kind: c.kind,
    units: complete.units,
    percentAgreement: pa?.value ?? null,
    kappa: { value: kappa?.value ?? null, ci95: kappa?.ci95 ?? null, weights },
    alpha: {
      value: alpha?.value ?? null,
      level: alphaLevel,
      ci95: alpha?.ci95 ?? null,
      bootstrap: alpha?.bootstrap ? { samples: alpha.bootstrap.samples, seed: alpha.bootstrap.seed, used: alpha.bootstrap.used } : null,
    },
    ac1: { value: ac1?.value ?? null, ci95: ac1?.ci95 ?? null },
    band: kappa?.value === null || kappa?.value === undefined ? null : agreementBand(kappa.value),
  };
}

export interface ReviewerPair {
  a: { id: string; name: string };
  b: { id: string; name: string };
  counts: { a: string | null; b: string | null; n: number }[];
}

/** One criterion's counts per unordered pair of reviewers ((A,B) and (B,A) are one pair; `a` is the smaller id). */
export function reviewerPairs(counts: readonly PairCount[], names: ReadonlyMap<string, string>): ReviewerPair[] {
  const pairs = new Map<string, ReviewerPair>();
  for (const r of counts) {
    const flip = r.ra > r.rb;
    const [x, y] = flip ? [r.rb, r.ra] : [r.ra, r.rb];
    const key = `${x}|${y}`;
    const entry = pairs.get(key) ?? { a: { id: x, name: names.get(x) ?? "" }, b: { id: y, name: names.get(y) ?? "" }, counts: [] };
    entry.counts.push(flip ? { a: r.b, b: r.a, n: r.n } : { a: r.a, b: r.b, n: r.n });
    pairs.set(key, entry);
  }
  return [...pairs.values()];
}

export interface ReviewerBias {
  reviewer: { id: string; name: string };
  n: number;
  meanDifference: number | null;
  ci95: [number, number] | null;
}

/**
 * Each reviewer's bias against consensus on a numeric or ordinal criterion: own value
 * (rank) minus the mean of the exam's two reads, i.e. ±(a − b)/2, averaged over the
 * reviewer's reads, with a normal-approximation interval of the mean (1.96 standard
 * errors; none from a single read). Counted pairs enter with their counts.
 */
export function biasAgainstConsensus(
  counts: readonly PairCount[],
  toRating: (v: string | null) => string | number | null,
  names: ReadonlyMap<string, string>,
): ReviewerBias[] {
  const diffs = new Map<string, { d: number; n: number }[]>();
  for (const r of counts) {
    const a = toRating(r.a);
    const b = toRating(r.b);
    if (typeof a !== "number" || typeof b !== "number") continue;
    for (const [who, d] of [
      [r.ra, (a - b) / 2],
      [r.rb, (b - a) / 2],
    ] as [string, number][]) {
      const xs = diffs.get(who) ?? [];
      xs.push({ d, n: r.n });
      diffs.set(who, xs);
    }
  }
  const bias: ReviewerBias[] = [];
  for (const [id, xs] of diffs) {
    const n = xs.reduce((s, x) => s + x.n, 0);
    const mean = xs.reduce((s, x) => s + x.n * x.d, 0) / n;
    const sd = n > 1 ? Math.sqrt(xs.reduce((s, x) => s + x.n * (x.d - mean) ** 2, 0) / (n - 1)) : null;
    bias.push({
      reviewer: { id, name: names.get(id) ?? "" },
      n,
      meanDifference: mean,
      ci95: sd === null ? null : [mean - (1.96 * sd) / Math.sqrt(n), mean + (1.96 * sd) / Math.sqrt(n)],
    });
  }
  return bias.sort((x, y) => x.reviewer.name.localeCompare(y.reviewer.name));
}
