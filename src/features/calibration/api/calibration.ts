// Calibration sets (QA lead only): the list with read progress, creating a set from chosen
// exams and reviewers, and a set's results (multi-rater agreement, matches with a reference).
import { queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import type { z } from "zod";
import type {
  CalibrationResults,
  NewCalibrationSet,
  ReferenceForm,
  calibrationSetCreatedSchema,
  calibrationSetListSchema,
} from "../../../../shared/schemas/calibration";
import type { AgreementReport, Disagreement } from "../../../../shared/schemas/reports";
import type { Member } from "../../../../shared/schemas/users";
import { api } from "../../../lib/api-client";
import { queryString } from "../../../lib/query-string";
import { isApiError } from "../../../lib/api-errors";

export type {
  CalibrationCriterion,
  CalibrationResults,
  MatchCount,
  NewCalibrationSet,
  ReferenceForm,
  ReferenceRow,
} from "../../../../shared/schemas/calibration";

/** An exam two reviewers scored differently, from the agreement report: a natural calibration pick. */
export type CandidateExam = Disagreement;
export type ProgramMember = Member;

export const calibrationKeys = {
  all: ["calibration-sets"] as const,
  list: () => ["calibration-sets", "list"] as const,
  results: (id: string) => ["calibration-sets", "results", id] as const,
  referenceForm: (examId: string) => ["calibration-sets", "reference-form", examId] as const,
  /** The exams offered for a new set: calibration's own entry, apart from the agreement report's ["reports", …] ones and the sets' prefix (creating a set does not change them). */
  candidates: () => ["calibration-candidates", { criterion: "quality" }] as const,
};

export const calibrationSetsQuery = queryOptions({
  queryKey: calibrationKeys.list(),
  queryFn: ({ signal }) => api<z.infer<typeof calibrationSetListSchema>>("/calibration-sets", { signal }),
});

export const calibrationResultsQuery = (id: string) =>
  queryOptions({
    queryKey: calibrationKeys.results(id),
    queryFn: ({ signal }) => api<CalibrationResults>(`/calibration-sets/${encodeURIComponent(id)}/results`, { signal }),
  });

/** An exam's application, criteria and findings for its reference answer; a missing or draft exam is a 404. */
export const referenceFormQuery = (examId: string) =>
  queryOptions({
    queryKey: calibrationKeys.referenceForm(examId),
    queryFn: ({ signal }) => api<ReferenceForm>(`/calibration-sets/exams/${encodeURIComponent(examId)}`, { signal }),
    staleTime: 5 * 60_000,
    // A 404 (no such submitted exam) will not change by asking again.
    retry: (count, error) => !isApiError(error, 404) && count < 2,
  });

/** Exams where two reviewers disagreed on overall image quality over the report's default range. */
export const candidateExamsQuery = queryOptions({
  queryKey: calibrationKeys.candidates(),
  queryFn: ({ signal }) => api<AgreementReport>(`/reports/agreement${queryString({ criterion: "quality" })}`, { signal }).then((r) => r.disagreements),
});

export function useCalibrationSets() {
  return useQuery(calibrationSetsQuery);
}

export function useCalibrationResults(id: string) {
  return useQuery(calibrationResultsQuery(id));
}

/** Creates a set and sends its calibration reads out; the list is refetched. */
export function useCreateCalibrationSet() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: NewCalibrationSet) => api<z.infer<typeof calibrationSetCreatedSchema>>("/calibration-sets", { method: "POST", body }),
    onSettled: () => queryClient.invalidateQueries({ queryKey: calibrationKeys.all }),
  });
}
