// QA lead reports: reviewer agreement per criterion (with pair matrix, confusion matrix,
// bias against consensus and the exams in disagreement) and the program's backlog,
// turnaround, volume and reviewer workload. Aggregation happens in PostgreSQL.
import { z } from "zod";
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../http/context";
import { activeRubricFor, getRubric } from "../../repositories/rubrics";
import { agreementOf, biasAgainstConsensus, countedRows, pairCounts, readPairs, ratingOf, reviewerPairs, type PairCount } from "../../services/agreement";
import { cohensKappa, percentAgreement } from "../../../shared/stats/index";
import type { Criterion } from "../../../shared/rubric/types";
import { FINDING_READS } from "../../../shared/catalogue";
import { isoDateSchema } from "../../../shared/schemas/common";

const dateRange = {
  from: isoDateSchema.optional(),
  to: isoDateSchema.optional(),
};

const READ_CRITERION = { key: "read" as const, label: "Interpretation (reads of findings)", kind: "choice" as const };

export function registerReportRoutes(kit: RouteKit, { db }: RouteContext) {
  defineRoute(kit, {
    method: "get",
    path: "/reports/agreement",
    summary: "Agreement between reviewers per criterion on double-read exams, with intervals and bands",
    tag: "reports",
    access: ["qa_lead", "admin"],
    query: z.object({
      ...dateRange,
      application: z.string().max(40).optional(),
      criterion: z.string().max(40).optional(),
      reviewerA: z.uuid().optional(),
      reviewerB: z.uuid().optional(),
    }),
    responses: { 200: { description: "Agreement report" } },
    handler: async ({ user, query }) => {
      const f = { programId: user.programId, from: query.from, to: query.to, application: query.application };
      const chosenKey = query.criterion ?? "quality";
      const disagreementQuery = readPairs(db, f).orderBy("e.performed_at", "desc").limit(100);
      const [rubric, counts, disagreements] = await Promise.all([
        activeRubricFor(db, user.programId),
        pairCounts(db, f),
        chosenKey === "read"
          ? disagreementQuery
              .whereRaw("p.reads::jsonb <> s.reads::jsonb")
              .select("e.id as examId", "e.code", "ap.name as application", db.raw("'reads differ' as a"), db.raw("'' as b"))
          : disagreementQuery
              .whereRaw("(p.scores->>?) IS DISTINCT FROM (s.scores->>?)", [chosenKey, chosenKey])
              .select("e.id as examId", "e.code", "ap.name as application", db.raw("p.scores->>? as a", [chosenKey]), db.raw("s.scores->>? as b", [chosenKey])),
      ]);
      const criteria: Criterion[] = rubric?.criteria ?? [];
      const byKey = new Map<string, PairCount[]>();
      for (const c of counts) byKey.set(c.key, [...(byKey.get(c.key) ?? []), c]);
      // Criteria of older versions that no longer exist still count, by their last known definition.
      for (const key of byKey.keys()) {
        if (key !== "read" && !criteria.some((c) => c.key === key)) {
          const old = await db("rubric_criteria as c")
            .join("rubrics as r", "r.id", "c.rubric_id")
            .where({ "r.program_id": user.programId, "c.key": key })
            .orderBy("r.version", "desc")
            .first("c.rubric_id");
          const def = old && (await getRubric(db, user.programId, old.rubric_id))?.criteria.find((c) => c.key === key);
          if (def) criteria.push(def);
        }
      }
      const rows = [...criteria.map((c) => agreementOf(c, byKey.get(c.key) ?? [])), agreementOf(READ_CRITERION, byKey.get("read") ?? [])];
      const chosen = criteria.find((c) => c.key === chosenKey);
      const toRating = ratingOf(chosen);
      const weights = chosen && (chosen.kind === "ordinal" || chosen.kind === "number") ? "quadratic" : "unweighted";
      const categoryValues = chosen ? chosen.levels.map((l) => ({ value: l.value, label: l.label })) : FINDING_READS.map((r) => ({ value: r, label: r }));
      const cats = chosen?.kind === "ordinal" ? chosen.levels.map((_, i) => i) : categoryValues.map((c) => c.value);

      const ids = [...new Set(counts.flatMap((c) => [c.ra, c.rb]))];
      const names = new Map<string, string>(
        ids.length
          ? (await db("users").whereIn("id", ids).select("id", "name")).map((u: { id: string; name: string }) => [u.id, u.name] as [string, string])
          : [],
      );
      // The chosen criterion per reviewer pair (none for the reads of findings).
      const chosenCounts = chosenKey === "read" ? [] : (byKey.get(chosenKey) ?? []);
      const pairList = reviewerPairs(chosenCounts, names);
      const pairs = pairList.map((p) => {
        const m = countedRows(p.counts, toRating, { complete: true });
        return {
          a: p.a,
          b: p.b,
          units: m.units,
          percentAgreement: m.units ? percentAgreement(m.rows, { multiplicity: m.multiplicity }).value : null,
          kappa: m.units >= 2 ? cohensKappa(m.rows, { weights, categories: cats, multiplicity: m.multiplicity }).value : null,
        };
      });

      // Confusion matrix: two chosen reviewers, or first read against second read.
      const byReviewers = chosenKey !== "read" && query.reviewerA && query.reviewerB;
      const chosenPair = byReviewers ? pairList.find((p) => [p.a.id, p.b.id].sort().join() === [query.reviewerA, query.reviewerB].sort().join()) : undefined;
      const confusionCounts = byReviewers
        ? (chosenPair?.counts.map((c) => (chosenPair.a.id === query.reviewerA ? c : { a: c.b, b: c.a, n: c.n })) ?? [])
        : (byKey.get(chosenKey) ?? []);
      const index = new Map(categoryValues.map((c, i) => [c.value, i]));
      const grid = categoryValues.map(() => categoryValues.map(() => 0));
      for (const c of confusionCounts) {
        const i = index.get(c.a ?? "");
        const j = index.get(c.b ?? "");
        if (i !== undefined && j !== undefined) grid[i][j] += c.n;
      }

      // Bias against consensus: own rank minus the mean of the exam's two reads, per reviewer.
      const bias = chosen && (chosen.kind === "ordinal" || chosen.kind === "number") ? biasAgainstConsensus(chosenCounts, toRating, names) : [];

      return {
        from: query.from ?? null,
        to: query.to ?? null,
        application: query.application ?? null,
        criterion: chosenKey,
        criteria: rows,
        pairs,
        confusion: {
          rowLabel: byReviewers ? (names.get(query.reviewerA!) ?? "Reviewer A") : "First read",
          colLabel: byReviewers ? (names.get(query.reviewerB!) ?? "Reviewer B") : "Second read",
          categories: categoryValues,
          counts: grid,
        },
        bias,
        disagreements,
      };
    },
  });

  defineRoute(kit, {
    method: "get",
    path: "/reports/program",
    summary: "Backlog by age, weekly turnaround (median, 90th percentile), volume per application, reviewer workload",
    tag: "reports",
    access: ["qa_lead", "admin"],
    query: z.object(dateRange),
    responses: { 200: { description: "Program report" } },
    handler: async ({ user, query }) => {
      const pid = user.programId;
      const from = query.from ?? new Date(Date.now() - 84 * 86400_000).toISOString().slice(0, 10);
      const to = query.to ?? new Date().toISOString().slice(0, 10);
      const inRange = (column: string) => db.raw(`${column} >= ?::date AND ${column} < ?::date + 1`, [from, to]);
      const [backlog, submitted, reviewed, volume, reviewers] = (await Promise.all([
        db("exams")
          .where("program_id", pid)
          .whereIn("status", ["submitted", "in_review", "adjudication"])
          .select(
            db.raw(
              `CASE WHEN now() - submitted_at < interval '1 day' THEN 'under 1 day' WHEN now() - submitted_at < interval '3 days' THEN '1–3 days' WHEN now() - submitted_at < interval '7 days' THEN '3–7 days' ELSE 'over 7 days' END AS bucket`,
            ),
            db.raw("count(*)::int AS count"),
          )
          .groupBy("bucket"),
        db("exams")
          .where("program_id", pid)
          .whereNotNull("submitted_at")
          .whereRaw(inRange("submitted_at"))
          .groupByRaw("1")
          .select(db.raw(`to_char(date_trunc('week', submitted_at), 'YYYY-MM-DD') AS week`), db.raw("count(*)::int AS n")),
        db("exam_results as r")
          .join("exams as e", "e.id", "r.exam_id")
          .where("r.program_id", pid)
          .whereRaw(inRange("r.decided_at"))
          .groupByRaw("1")
          .select(
            db.raw(`to_char(date_trunc('week', r.decided_at), 'YYYY-MM-DD') AS week`),
            db.raw("count(*)::int AS n"),
            db.raw("percentile_cont(0.5) WITHIN GROUP (ORDER BY extract(epoch FROM r.decided_at - e.submitted_at) / 3600) AS median"),
            db.raw("percentile_cont(0.9) WITHIN GROUP (ORDER BY extract(epoch FROM r.decided_at - e.submitted_at) / 3600) AS p90"),
          ),
        db("exams as e")
          .join("applications as ap", "ap.id", "e.application_id")
          .where("e.program_id", pid)
          .whereNotNull("e.submitted_at")
          .whereRaw(inRange("e.submitted_at"))
          .groupByRaw("1, 2")
          .select(db.raw(`to_char(date_trunc('week', e.submitted_at), 'YYYY-MM-DD') AS week`), "ap.name as application", db.raw("count(*)::int AS count"))
          .orderBy(["week", "application"]),
        db("memberships as m")
          .join("users as u", "u.id", "m.user_id")
          .where("m.program_id", pid)
          .whereRaw(`'reviewer' = ANY(m.roles)`)
          .select(
            "u.id",
            "u.name",
            db.raw(
              `(SELECT count(*)::int FROM reviews r WHERE r.reviewer_id = u.id AND r.program_id = ? AND r.submitted_at >= ?::date AND r.submitted_at < ?::date + 1) AS reviews`,
              [pid, from, to],
            ),
            db.raw(
              `(SELECT percentile_cont(0.5) WITHIN GROUP (ORDER BY r.time_spent_seconds) FROM reviews r WHERE r.reviewer_id = u.id AND r.program_id = ? AND r.submitted_at >= ?::date AND r.submitted_at < ?::date + 1) AS median_seconds`,
              [pid, from, to],
            ),
            db.raw(
              `(SELECT count(*)::int FROM assignments a WHERE a.reviewer_id = u.id AND a.program_id = ? AND a.state = 'claimed' AND a.lease_expires_at > now()) AS held`,
              [pid],
            ),
          )
          .orderBy("u.name"),
      ])) as [
        { bucket: string; count: number }[],
        { week: string; n: number }[],
        { week: string; n: number; median: number | null; p90: number | null }[],
        { week: string; application: string; count: number }[],
        { id: string; name: string; reviews: number; median_seconds: number | null; held: number }[],
      ];
      const weeks = [...new Set([...submitted.map((s) => s.week), ...reviewed.map((r) => r.week)])].sort();
      const round = (x: number | null) => (x === null || x === undefined ? null : Math.round(Number(x) * 10) / 10);
      return {
        from,
        to,
        backlog: ["under 1 day", "1–3 days", "3–7 days", "over 7 days"].map((bucket) => ({
          bucket,
          count: backlog.find((b) => b.bucket === bucket)?.count ?? 0,
        })),
        weekly: weeks.map((week) => {
          const r = reviewed.find((x) => x.week === week);
          return {
            week,
            submitted: submitted.find((x) => x.week === week)?.n ?? 0,
            reviewed: r?.n ?? 0,
            turnaroundMedianHours: round(r?.median ?? null),
            turnaroundP90Hours: round(r?.p90 ?? null),
          };
        }),
        volume,
        reviewers: reviewers.map((r) => ({
          id: r.id,
          name: r.name,
          reviews: r.reviews,
          medianSeconds: r.median_seconds === null ? null : Math.round(Number(r.median_seconds)),
          held: r.held,
        })),
      };
    },
  });
}
