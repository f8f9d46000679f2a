// Cache keys that cross features: a feature that changes data another feature shows
// invalidates that feature's key from here, and the owner builds its own keys on the same
// constants, so the two cannot drift apart. Keys only a feature itself uses stay in its api file.

export const queryKeys = {
  /** The home page's per-role counts (features/home). */
  home: ["home"] as const,
  /** The signed-in person's notifications (features/notifications). */
  notifications: ["notifications"] as const,
  /** The sonographer's feedback list and details (features/feedback). */
  feedback: ["feedback"] as const,
  /** The sonographer's own progress (features/progress). */
  progress: ["progress"] as const,
  /** The QA lead's roster and sonographer pages (features/roster). */
  roster: ["roster"] as const,
  /** Exams: lists and details (features/exams). */
  exams: ["exams"] as const,
  /** One exam (GET /api/exams/:id, its `exam`). */
  examDetail: (id: string) => ["exams", "detail", id] as const,
  /** Rubrics (features/rubrics); settings keeps the published criteria under this prefix so a rubric change refreshes them. */
  rubrics: ["rubrics"] as const,
  /** Members and invitations of the program (features/people). */
  users: ["users"] as const,
  /** The program's members (GET /api/users), shown by people, calibration and oversight. */
  members: ["users", "members"] as const,
};
