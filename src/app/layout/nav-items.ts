// Navigation by role; only screens that exist are listed. Hiding a link is convenience;
// the server still decides access.
import type { Role } from "../../../shared/roles";

export interface NavItem {
  to: string;
  label: string;
  /** Roles that see the link; undefined means every signed-in user. */
  roles?: readonly Role[];
  end?: boolean;
}

export interface NavGroup {
  label: string | null;
  items: NavItem[];
}

export const NAV_GROUPS: NavGroup[] = [
  { label: null, items: [{ to: "/", label: "Home", end: true }] },
  {
    label: "Scanning",
    items: [
      { to: "/exams/new", label: "Submit", roles: ["sonographer"] },
      { to: "/exams", label: "My exams", roles: ["sonographer"], end: true },
      { to: "/received", label: "Received studies", roles: ["sonographer", "qa_lead", "admin"] },
      { to: "/feedback", label: "Feedback", roles: ["sonographer"] },
      { to: "/progress", label: "Progress", roles: ["sonographer"] },
    ],
  },
  {
    label: "Reviewing",
    items: [
      { to: "/queue", label: "Queue", roles: ["reviewer"] },
      { to: "/reviews/questions", label: "Questions", roles: ["reviewer", "qa_lead"] },
    ],
  },
  {
    label: "Oversight",
    items: [
      { to: "/oversight/adjudication", label: "Adjudication", roles: ["qa_lead"] },
      { to: "/oversight/agreement", label: "Agreement", roles: ["qa_lead", "admin"] },
      { to: "/oversight/calibration", label: "Calibration", roles: ["qa_lead"] },
      { to: "/oversight/follow-ups", label: "Follow-ups", roles: ["qa_lead"] },
      { to: "/oversight/program", label: "Program", roles: ["qa_lead", "admin"] },
      { to: "/oversight/roster", label: "Roster", roles: ["qa_lead"] },
      { to: "/oversight/reports", label: "Reports", roles: ["qa_lead"] },
    ],
  },
  {
    label: "Setup",
    items: [
      { to: "/setup/rubrics", label: "Rubrics", roles: ["qa_lead"] },
      { to: "/setup/snippets", label: "Snippets", roles: ["qa_lead"] },
      { to: "/setup/people", label: "People", roles: ["admin", "qa_lead"] },
      { to: "/setup/applications", label: "Applications", roles: ["admin", "qa_lead"] },
      { to: "/setup/settings", label: "Program settings", roles: ["admin", "qa_lead"] },
      { to: "/setup/audit", label: "Audit log", roles: ["admin"] },
    ],
  },
];

/** The groups and links a user with these roles sees; empty groups are dropped. */
export function navFor(roles: readonly Role[]): NavGroup[] {
  return NAV_GROUPS.map((group) => ({
    ...group,
    items: group.items.filter((item) => !item.roles || item.roles.some((r) => roles.includes(r))),
  })).filter((group) => group.items.length > 0);
}
