// The queries behind the program report (README "Architecture": aggregation happens in
// PostgreSQL): backlog by age, weekly submissions and turnaround, volume per application,
// reviewer workload, over a range of days (`to` includes its whole day).
import type { Db } from "../db/knex";

export interface ProgramReportRows {
  backlog: { bucket: string; count: number }[];
  submitted: { week: string; n: number }[];
  reviewed: { week: string; n: number; median: number | null; p90: number | null }[];
  volume: { week: string; application: string; count: number }[];
  reviewers: { id: string; name: string; reviews: number; median_seconds: number | null; held: number }[];
}

export async function programReportRows(db: Db, pid: string, from: string, to: string): Promise<ProgramReportRows> {
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
    // Volume per application across its versions, under the name of its published version.
    db("exams as e")
      .join("applications as v", "v.id", "e.application_id")
      .join("applications as ap", function () {
        this.on("ap.program_id", "=", "v.program_id").andOn("ap.code", "=", "v.code").andOnVal("ap.status", "=", "published");
      })
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
  return { backlog, submitted, reviewed, volume, reviewers };
}
