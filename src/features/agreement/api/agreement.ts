// The agreement report (GET /api/reports/agreement): per-criterion coefficients, the
// reviewer-pair matrix, a confusion matrix, bias against consensus and the exams in
// disagreement, for a date range and optionally one application.
import { keepPreviousData, queryOptions } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { queryString } from "../../../lib/query-string";

export type Interval = [number, number];

export interface CriterionAgreement {
  key: string;
  label: string;
  kind: string;
  /** Units (exams) read twice or more. */
  units: number;
  percentAgreement: number | null;
  kappa: { value: number | null; ci95: Interval | null; weights: "quadratic" | "unweighted"; reason?: string };
  alpha: {
    value: number | null;
    level: "ordinal" | "nominal" | "interval";
    /** Percentile bootstrap over exams; null when alpha or the interval is not computable. */
    ci95?: Interval | null;
    /** Resamples drawn, seed, and resamples with a defined alpha. */
    bootstrap?: { samples: number; seed: number; used: number } | null;
    reason?: string;
  };
  ac1: { value: number | null; ci95: Interval | null; reason?: string };
  band: string | null;
}

export interface Person {
  id: string;
  name: string;
}

export interface PairAgreement {
  a: Person;
  b: Person;
  units: number;
  percentAgreement: number | null;
  kappa: number | null;
}

export interface Confusion {
  rowLabel: string;
  colLabel: string;
  categories: { value: string; label: string }[];
  counts: number[][];
}

export interface ReviewerBias {
  reviewer: Person;
  n: number;
  meanDifference: number | null;
  ci95: Interval | null;
}

export interface Disagreement {
  examId: string;
  code: string;
  application: string;
  a: string | number | null;
  b: string | number | null;
}

export interface AgreementReport {
  from: string;
  to: string;
  application: string | null;
  criterion: string;
  criteria: CriterionAgreement[];
  pairs: PairAgreement[];
  confusion: Confusion;
  bias: ReviewerBias[];
  disagreements: Disagreement[];
}

export interface AgreementFilters {
  from: string;
  to: string;
  application?: string;
  criterion?: string;
  reviewerA?: string;
  reviewerB?: string;
}

/** The report for these filters; the previous report stays on screen while the next loads. */
export function agreementQuery(filters: AgreementFilters) {
  return queryOptions({
    queryKey: ["reports", "agreement", filters],
    queryFn: ({ signal }) => api<AgreementReport>(`/reports/agreement${queryString({ ...filters })}`, { signal }),
    placeholderData: keepPreviousData,
  });
}
