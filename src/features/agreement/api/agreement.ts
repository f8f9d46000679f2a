// The agreement report (GET /api/reports/agreement): per-criterion coefficients, the
// reviewer-pair matrix, a confusion matrix, bias against consensus and the exams in
// disagreement, for a date range and optionally one application.
import { keepPreviousData, queryOptions } from "@tanstack/react-query";
import type { AgreementReport, Confusion, CriterionAgreement, Disagreement, PairAgreement, Person, ReviewerBias } from "../../../../shared/schemas/reports";
import { api } from "../../../lib/api-client";
import { queryString } from "../../../lib/query-string";

export type { Confusion, CriterionAgreement, Disagreement, PairAgreement, Person, ReviewerBias };

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
