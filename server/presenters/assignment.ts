// What a reviewer sees of an assignment: the exam by its code, its clips and the rubric —
// never the sonographer's name, e-mail or id (unless the program turned blinding off), never
// the sonographer's own reads, and never another reviewer's scores.
import type { Rubric } from "../../shared/rubric/types";
import { criteriaFor } from "../../shared/rubric/logic";
import { guideOf, presentClip, type ClipRow } from "./exam";
import type { Orientation } from "../../shared/catalogue";

export interface AssignmentRow {
  id: string;
  kind: string;
  state: string;
  claimed_at: Date | null;
  lease_expires_at: Date | null;
  due_at: Date;
}

export function presentAssignment(a: AssignmentRow) {
  return {
    id: a.id,
    kind: a.kind,
    state: a.state,
    claimedAt: a.claimed_at?.toISOString() ?? null,
    leaseExpiresAt: a.lease_expires_at?.toISOString() ?? null,
    dueAt: a.due_at.toISOString(),
  };
}

export function presentBlindedExam(p: {
  exam: {
    id: string;
    code: string;
    performed_at: Date;
    setting: string;
    transducer: string;
    preset: string;
    indication: string;
    app_code: string;
    app_name: string;
    application_id: string;
    app_version: number;
    app_orientation: Orientation;
    app_cautions: string[];
    sonographer_name: string;
  };
  clips: ClipRow[];
  views: { key: string; label: string }[];
  findings: { key: string; label: string; hint: string }[];
  blindSonographer: boolean;
}) {
  const e = p.exam;
  return {
    id: e.id,
    code: e.code,
    application: { code: e.app_code, name: e.app_name },
    performedAt: e.performed_at.toISOString(),
    setting: e.setting,
    transducer: e.transducer,
    preset: e.preset,
    indication: e.indication,
    views: p.views,
    findings: p.findings,
    guide: guideOf(e),
    sonographer: p.blindSonographer ? null : { name: e.sonographer_name },
    clips: p.clips.filter((c) => c.state === "ready").map((c) => presentClip(c, { forOwner: false })),
  };
}

/** The rubric as the scoring screen needs it: only the criteria for this application. */
export const presentRubricFor = (rubric: Rubric, applicationCode: string) => ({
  id: rubric.id,
  name: rubric.name,
  version: rubric.version,
  criteria: criteriaFor(rubric.criteria, applicationCode),
});
