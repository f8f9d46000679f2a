// Calibration sets (QA lead only): the list with read progress, creating a set from chosen
// exams and reviewers, and a set's results (multi-rater agreement, matches with a reference).
import { queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import type { Role } from "../../../../shared/roles";
import type { FindingRead } from "../../../../shared/catalogue";
import type { Criterion, ScoreValue } from "../../../../shared/rubric/types";
import { api, isApiError } from "../../../lib/api-client";

export type Interval = [number, number];

export interface CalibrationSetSummary {
  id: string;
  name: string;
  createdAt: string;
  /** Exams in the set. */
  exams: number;
  /** Calibration reads sent out (exams × reviewers, less a sonographer's own exams). */
  reads: number;
  /** Reads submitted so far. */
  done: number;
}

export interface Person {
  id: string;
  name: string;
}

export interface CalibrationCriterion {
  key: string;
  label: string;
  /** Exams every reviewer has read for this criterion. */
  units: number;
  fleiss: { value: number | null; ci95: Interval | null } | null;
  alpha: { value: number | null };
  band: string | null;
}

export interface MatchCount {
  compared: number;
  matched: number;
  share: number | null;
}

/** One reviewer against the reference answers: scores (top level) and reads of findings. */
export interface ReviewerVsReference extends MatchCount {
  reviewer: Person;
  reads: MatchCount;
}

/** One value of a reference answer beside each reviewer's (null while a reviewer has not read the exam). */
export interface ReferenceRow {
  kind: "score" | "read";
  key: string;
  label: string;
  reference: { value: ScoreValue; label: string };
  given: { reviewerId: string; value: ScoreValue | null; label: string | null; matches: boolean | null }[];
}

export interface CalibrationResults {
  id: string;
  name: string;
  exams: { id: string; code: string; application: { code: string; name: string }; hasReference: boolean }[];
  reviewers: Person[];
  criteria: CalibrationCriterion[];
  vsReference: ReviewerVsReference[];
  referenceDetail: { examId: string; code: string; rows: ReferenceRow[] }[];
}

/** What the new-set form needs to take a reference answer for one exam. */
export interface ReferenceForm {
  exam: { id: string; code: string; application: { code: string; name: string } };
  rubric: { id: string; name: string; version: number };
  /** The rubric's criteria for the exam's application, in display order. */
  criteria: Criterion[];
  findings: { key: string; label: string }[];
}

/** The QA lead's answer for one exam, as sent: either part may be partial. */
export interface ReferenceAnswer {
  scores: Record<string, ScoreValue>;
  reads: { key: string; read: FindingRead }[];
}

/** An exam two reviewers scored differently, from the agreement report: a natural calibration pick. */
export interface CandidateExam {
  examId: string;
  code: string;
  application: string;
  a: string | number | null;
  b: string | number | null;
}

export interface ProgramMember {
  id: string;
  name: string;
  email: string;
  roles: Role[];
  active: boolean;
}

export interface NewCalibrationSet {
  name: string;
  exams: { examId: string; reference?: ReferenceAnswer }[];
  /** Left out to send the set to every active reviewer. */
  reviewerIds?: string[];
}

export const calibrationKeys = {
  all: ["calibration-sets"] as const,
  list: () => ["calibration-sets", "list"] as const,
  results: (id: string) => ["calibration-sets", "results", id] as const,
  referenceForm: (examId: string) => ["calibration-sets", "reference-form", examId] as const,
};

export const calibrationSetsQuery = queryOptions({
  queryKey: calibrationKeys.list(),
  queryFn: ({ signal }) => api<{ items: CalibrationSetSummary[] }>("/calibration-sets", { signal }),
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
  queryKey: ["reports", "agreement", { criterion: "quality" }, "disagreements"],
  queryFn: ({ signal }) => api<{ disagreements: CandidateExam[] }>("/reports/agreement?criterion=quality", { signal }).then((r) => r.disagreements),
});

/** The program's members (same cache entry as Setup → People). */
export const membersQuery = queryOptions({
  queryKey: ["users", "members"],
  queryFn: ({ signal }) => api<{ members: ProgramMember[] }>("/users", { signal }),
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
    mutationFn: (body: NewCalibrationSet) => api<{ id: string }>("/calibration-sets", { method: "POST", body }),
    onSettled: () => queryClient.invalidateQueries({ queryKey: calibrationKeys.all }),
  });
}
