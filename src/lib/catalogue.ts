// The program's application catalogue, shared by the screens that show it (Setup) and the
// ones that build on it (the exam form): one query, one cache entry.
import { queryOptions } from "@tanstack/react-query";
import type { ApplicationList } from "../../shared/schemas/applications";
import type { ExamSetting, FindingRead, Transducer } from "../../shared/catalogue";
import { api } from "./api-client";

/** GET /api/applications, cached for a few minutes: the catalogue changes rarely. */
export const applicationsQuery = queryOptions({
  queryKey: ["applications", "list"],
  queryFn: ({ signal }) => api<ApplicationList>("/applications", { signal }),
  staleTime: 5 * 60_000,
});

export const TRANSDUCER_LABELS: Record<Transducer, string> = {
  linear: "Linear",
  curvilinear: "Curvilinear",
  phased: "Phased array",
  endocavitary: "Endocavitary",
};

export const SETTING_LABELS: Record<ExamSetting, string> = {
  clinical: "Clinical",
  educational: "Educational",
  simulated: "Simulated",
};

export const READ_LABELS: Record<FindingRead, string> = {
  positive: "Positive",
  negative: "Negative",
  indeterminate: "Indeterminate",
};
