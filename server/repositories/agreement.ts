// The queries behind the agreement report (README "Architecture": aggregation happens in
// PostgreSQL): the first and second reads of double-read exams, counted per criterion value
// pair and reviewer pair, the exams in disagreement, and criteria of older rubric versions.
import type { Knex } from "knex";
import type { Db } from "../db/knex";
import type { Criterion } from "../../shared/rubric/types";
import { getRubric } from "./rubrics";

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

/** Double-read exams whose two reads differ on criterion `key` (or, for `read`, on any finding), newest first. */
export function disagreementsOn(
  db: Db,
  f: AgreementFilters,
  key: string,
  limit = 100,
): Promise<{ examId: string; code: string; application: string; a: string | null; b: string | null }[]> {
  const q = readPairs(db, f).orderBy("e.performed_at", "desc").limit(limit);
  return key === "read"
    ? q
        .whereRaw("p.reads::jsonb <> s.reads::jsonb")
        .select("e.id as examId", "e.code", "ap.name as application", db.raw("'reads differ' as a"), db.raw("'' as b"))
    : q
        .whereRaw("(p.scores->>?) IS DISTINCT FROM (s.scores->>?)", [key, key])
        .select("e.id as examId", "e.code", "ap.name as application", db.raw("p.scores->>? as a", [key]), db.raw("s.scores->>? as b", [key]));
}

/** A criterion that no longer exists, by its definition in the newest rubric version that had it. */
export async function lastCriterionDefinition(db: Db, programId: string, key: string): Promise<Criterion | undefined> {
  const old = await db("rubric_criteria as c")
    .join("rubrics as r", "r.id", "c.rubric_id")
    .where({ "r.program_id": programId, "c.key": key })
    .orderBy("r.version", "desc")
    .first("c.rubric_id");
  return old ? (await getRubric(db, programId, old.rubric_id))?.criteria.find((c) => c.key === key) : undefined;
}

/** Users' names by id. */
export async function userNames(db: Db, ids: string[]): Promise<Map<string, string>> {
  if (ids.length === 0) return new Map();
  const rows: { id: string; name: string }[] = await db("users").whereIn("id", ids).select("id", "name");
  return new Map(rows.map((u) => [u.id, u.name]));
}
