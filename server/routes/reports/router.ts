// QA lead reports: reviewer agreement per criterion (with pair matrix, confusion matrix,
// bias against consensus and the exams in disagreement) and the program's backlog,
// turnaround, volume and reviewer workload. Aggregation happens in PostgreSQL.
import { z } from "zod";
import { defineRoute, type RouteKit } from "../../http/route";
import type { RouteContext } from "../../app";
import { activeRubricFor, getRubric } from "../../repositories/rubrics";
import { agreementOf, pairCounts, readPairs, ratingOf, expand } from "../../services/agreement";
import { cohensKappa, percentAgreement } from "../../../shared/stats/index";
import type { Criterion } from "../../../shared/rubric/types";
import { FINDING_READS } from "../../../shared/catalogue";

const dateRange = {
  from: z.iso.date().optional(),
  to: z.iso.date().optional(),
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
      const rubric = await activeRubricFor(db, user.programId);
      const criteria: Criterion[] = rubric?.criteria ?? [];
      // Criteria of older versions that no longer exist still count, by their last known definition.
      const counts = await pairCounts(db, f);
      const keys = [...new Set(counts.map((c) => c.key))];
      for (const key of keys) {
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
      const rows = [
        ...criteria.map((c) =>
          agreementOf(
            c,
            counts.filter((x) => x.key === c.key),
          ),
        ),
        agreementOf(
          READ_CRITERION,
          counts.filter((x) => x.key === "read"),
        ),
      ];
      const chosenKey = query.criterion ?? "quality";
      const chosen = criteria.find((c) => c.key === chosenKey);
      const toRating = ratingOf(chosen);
      const weights = chosen && (chosen.kind === "ordinal" || chosen.kind === "number") ? "quadratic" : "unweighted";
      const categoryValues = chosen ? chosen.levels.map((l) => ({ value: l.value, label: l.label })) : FINDING_READS.map((r) => ({ value: r, label: r }));
      const cats = chosen?.kind === "ordinal" ? chosen.levels.map((_, i) => i) : categoryValues.map((c) => c.value);

      // The chosen criterion's value of a read, as SQL.
      const valueOf = (alias: "p" | "s") => (chosenKey === "read" ? null : db.raw(`${alias}.scores->>?`, [chosenKey]));
      const pairRows: { a: string | null; b: string | null; ra: string; rb: string; na: string; nb: string; n: number }[] =
        chosenKey === "read"
          ? []
          : await readPairs(db, f)
              .join("users as ua", "ua.id", "p.reviewer_id")
              .join("users as ub", "ub.id", "s.reviewer_id")
              .groupBy("p.reviewer_id", "s.reviewer_id", "ua.name", "ub.name", db.raw("1"), db.raw("2"))
              .select(
                db.raw("p.scores->>? as a", [chosenKey]),
                db.raw("s.scores->>? as b", [chosenKey]),
                "p.reviewer_id as ra",
                "s.reviewer_id as rb",
                "ua.name as na",
                "ub.name as nb",
                db.raw("count(*)::int as n"),
              );
      // Pairs are unordered: (A,B) and (B,A) are one pair; kappa is the same either way round.
      const pairMap = new Map<
        string,
        { a: { id: string; name: string }; b: { id: string; name: string }; counts: { a: string | null; b: string | null; n: number }[] }
      >();
      for (const r of pairRows) {
        const flip = r.ra > r.rb;
        const key = flip ? `${r.rb}|${r.ra}` : `${r.ra}|${r.rb}`;
        const entry = pairMap.get(key) ?? {
          a: { id: flip ? r.rb : r.ra, name: flip ? r.nb : r.na },
          b: { id: flip ? r.ra : r.rb, name: flip ? r.na : r.nb },
          counts: [],
        };
        entry.counts.push(flip ? { a: r.b, b: r.a, n: r.n } : { a: r.a, b: r.b, n: r.n });
        pairMap.set(key, entry);
      }
      const pairs = [...pairMap.values()].map((p) => {
        const m = expand(p.counts, toRating).filter((x) => x[0] !== null && x[1] !== null);
        return {
          a: p.a,
          b: p.b,
          units: m.length,
          percentAgreement: m.length ? percentAgreement(m).value : null,
          kappa: m.length >= 2 ? cohensKappa(m, { weights, categories: cats }).value : null,
        };
      });

      // Confusion matrix: two chosen reviewers, or first read against second read.
      const confusionCounts =
        chosenKey === "read"
          ? counts.filter((c) => c.key === "read")
          : query.reviewerA && query.reviewerB
            ? ([...pairMap.values()]
                .find((p) => [p.a.id, p.b.id].sort().join() === [query.reviewerA, query.reviewerB].sort().join())
                ?.counts.map((c) => (pairMap.get(`${query.reviewerA}|${query.reviewerB}`) ? c : { a: c.b, b: c.a, n: c.n })) ?? [])
            : counts.filter((c) => c.key === chosenKey);
      const index = new Map(categoryValues.map((c, i) => [c.value, i]));
      const grid = categoryValues.map(() => categoryValues.map(() => 0));
      for (const c of confusionCounts) {
        const i = index.get(c.a ?? "");
        const j = index.get(c.b ?? "");
        if (i !== undefined && j !== undefined) grid[i][j] += c.n;
      }
      const names = new Map(
        pairRows.flatMap(
          (r) =>
            [
              [r.ra, r.na],
              [r.rb, r.nb],
            ] as [string, string][],
        ),
      );

      // Bias against consensus: own rank minus the mean of the exam's two reads, per reviewer.
      const bias: { reviewer: { id: string; name: string }; n: number; meanDifference: number | null; ci95: [number, number] | null }[] = [];
      if (chosen && (chosen.kind === "ordinal" || chosen.kind === "number")) {
        const diffs = new Map<string, number[]>();
        for (const r of pairRows) {
          const a = toRating(r.a);
          const b = toRating(r.b);
          if (typeof a !== "number" || typeof b !== "number") continue;
          for (const [who, d] of [
            [r.ra, (a - b) / 2],
            [r.rb, (b - a) / 2],
          ] as [string, number][]) {
            const xs = diffs.get(who) ?? [];
            for (let i = 0; i < r.n; i++) xs.push(d);
            diffs.set(who, xs);
          }
        }
        for (const [id, xs] of diffs) {
          const n = xs.length;
          const mean = xs.reduce((s, x) => s + x, 0) / n;
          const sd = n > 1 ? Math.sqrt(xs.reduce((s, x) => s + (x - mean) ** 2, 0) / (n - 1)) : null;
          // Normal-approximation interval of the mean (1.96 standard errors); none from one read.
          bias.push({
            reviewer: { id, name: names.get(id) ?? "" },
            n,
            meanDifference: mean,
            ci95: sd === null ? null : [mean - (1.96 * sd) / Math.sqrt(n), mean + (1.96 * sd) / Math.sqrt(n)],
          });
        }
        bias.sort((x, y) => x.reviewer.name.localeCompare(y.reviewer.name));
      }

      const disagreementQuery = readPairs(db, f).orderBy("e.performed_at", "desc").limit(100);
      const disagreements =
        chosenKey === "read"
          ? await disagreementQuery
              .whereRaw("p.reads::jsonb <> s.reads::jsonb")
              .select("e.id as examId", "e.code", "ap.name as application", db.raw("'reads differ' as a"), db.raw("'' as b"))
          : await disagreementQuery
              .whereRaw("(p.scores->>?) IS DISTINCT FROM (s.scores->>?)", [chosenKey, chosenKey])
              .select("e.id as examId", "e.code", "ap.name as application", valueOf("p")!.wrap("", " as a"), valueOf("s")!.wrap("", " as b"));

      return {
        from: query.from ?? null,
        to: query.to ?? null,
        application: query.application ?? null,
        criterion: chosenKey,
        criteria: rows,
        pairs,
        confusion: {
          rowLabel: query.reviewerA && query.reviewerB ? (names.get(query.reviewerA) ?? "Reviewer A") : "First read",
          colLabel: query.reviewerA && query.reviewerB ? (names.get(query.reviewerB) ?? "Reviewer B") : "Second read",
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
