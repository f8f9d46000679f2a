// The program report (GET /api/reports/program): backlog by age, weekly throughput and
// turnaround (median, 90th percentile, in hours), volume per application per week and
// reviewer workload, shaped from the rows PostgreSQL aggregated.
import type { ProgramReportRows } from "../repositories/program-report";
import { BACKLOG_BUCKETS, type ProgramReport } from "../../shared/schemas/reports";

export function programReport(
  from: string,
  to: string,
  { backlog, submitted, reviewed, volume, reviewers }: ProgramReportRows,
): Omit<ProgramReport, "followUps"> {
  const weeks = [...new Set([...submitted.map((s) => s.week), ...reviewed.map((r) => r.week)])].sort();
  const round = (x: number | null) => (x === null || x === undefined ? null : Math.round(Number(x) * 10) / 10);
  return {
    from,
    to,
    backlog: BACKLOG_BUCKETS.map((bucket) => ({
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
}
