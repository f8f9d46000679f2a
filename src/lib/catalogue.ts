// The program's application catalogue, shared by the screens that show it (Setup) and the
// ones that build on it (the exam form): one query, one cache entry.
import { queryOptions } from "@tanstack/react-query";
import type { ApplicationAnswer, ApplicationList } from "../../shared/schemas/applications";
import type { ExamSetting, FindingRead, Orientation, Transducer } from "../../shared/catalogue";
import { api } from "./api-client";

/** GET /api/applications, cached for a few minutes: the catalogue changes rarely. */
export const applicationsQuery = queryOptions({
  queryKey: ["applications", "list"],
  queryFn: ({ signal }) => api<ApplicationList>("/applications", { signal }),
  staleTime: 5 * 60_000,
});

/**
 * GET /api/applications/:id: one version of an application, the labels an exam recorded under
 * it keeps. Its content never changes (only its status, when the next version is saved).
 */
export const applicationVersionQuery = (id: string) =>
  queryOptions({
    queryKey: ["applications", "version", id],
    queryFn: ({ signal }) => api<ApplicationAnswer>(`/applications/${encodeURIComponent(id)}`, { signal }),
    staleTime: 5 * 60_000,
    enabled: !!id,
  });

export const TRANSDUCER_LABELS: Record<Transducer, string> = {
  linear: "Linear",
  curvilinear: "Curvilinear",
  phased: "Phased array",
  endocavitary: "Endocavitary",
};

/** The orientation convention of an application, as the reviewer reads it beside the orientation criterion. */
export const ORIENTATION_LABELS: Record<Orientation, string> = {
  screen_left: "Screen-left: the marker side (the patient's head in longitudinal planes, the patient's right in transverse) is on the left of the screen",
  cardiology: "Cardiology convention: the marker side is on the right of the screen; a view that follows it is not flipped",
};

/** Whether a rubric criterion judges the orientation marker (the default rubric's "marker", or one named for orientation). */
export const isOrientationCriterion = (c: { key: string; label: string }) => c.key === "marker" || /orientation/i.test(c.label);

export const SETTING_LABELS: Record<ExamSetting, string> = {
  clinical: "Clinical",
  educational: "Educational",
  simulated: "Simulated",
};

/** What each setting means, where the clinician chooses it. */
export const SETTING_HINTS: Record<ExamSetting, string> = {
  clinical: "a patient in your care, scanned to decide their care; a misread may need a patient callback.",
  educational: "a scan for learning (a volunteer, a teaching session, or a patient scanned only for practice); it does not guide care.",
  simulated: "a simulator or phantom; no patient.",
};

export const READ_LABELS: Record<FindingRead, string> = {
  positive: "Positive",
  negative: "Negative",
  indeterminate: "Indeterminate",
};
