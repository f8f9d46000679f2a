// The four roles of a program membership. One person may hold several.
export const ROLES = ["sonographer", "reviewer", "qa_lead", "admin"] as const;
export type Role = (typeof ROLES)[number];

/** Plain-language label for a role, as shown on screens. */
export const ROLE_LABELS: Record<Role, string> = {
  sonographer: "Clinician",
  reviewer: "Reviewer",
  qa_lead: "QA lead",
  admin: "Administrator",
};
