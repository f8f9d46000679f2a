// Calibration sets (QA lead only): the list with read progress, creating a set from chosen
// exams and reviewers, and a set's results (multi-rater agreement, matches with a reference).
import { queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import type { Role } from "../../../../shared/roles";
import { api } from "../../../lib/api-client";

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

export interface ReviewerVsReference {
  reviewer: Person;
  compared: number;
  matched: number;
  share: number | null;
}

export interface CalibrationResults {
  id: string;
  name: string;
  exams: { id: string; code: string; hasReference: boolean }[];
  reviewers: Person[];
  criteria: CalibrationCriterion[];
  vsReference: ReviewerVsReference[];
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
  exams: { examId: string }[];
  /** Left out to send the set to every active reviewer. */
  reviewerIds?: string[];
}

export const calibrationKeys = {
  all: ["calibration-sets"] as const,
  list: () => ["calibration-sets", "list"] as const,
  results: (id: string) => ["calibration-sets", "results", id] as const,
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
