// The adjudication list: exams whose double reads disagree beyond tolerance, with both reads
// side by side and the criteria they differ on. A reviewer sees only those handed to them.
import type { Db } from "../db/knex";
import type { Role } from "../../shared/roles";
import { disagreements } from "../../shared/rubric/logic";
import { listUndecidedAdjudications } from "../repositories/assignments";
import { doubleReadsWithReviewers } from "../repositories/reviews";
import { getRubric } from "../repositories/rubrics";
import { adjudicationsVisibleTo } from "../policies/review";

export async function openAdjudications(db: Db, viewer: { id: string; programId: string; roles: readonly Role[] }) {
  const rows = await listUndecidedAdjudications(db, viewer.programId, adjudicationsVisibleTo(viewer));
  const reads = await doubleReadsWithReviewers(
    db,
    rows.map((r) => r.exam_id),
  );
  const items = [];
  for (const r of rows) {
    const rubric = await getRubric(db, viewer.programId, r.rubric_id);
    const both = reads.filter((x) => x.exam_id === r.exam_id);
    const primary = both.find((x) => x.kind === "primary");
    const second = both.find((x) => x.kind === "second");
    items.push({
      ...r,
      rubric: rubric ?? null,
      reads: both,
      disagreements: rubric && primary && second ? disagreements(rubric.criteria, r.app_code, primary, second).map((d) => d.key) : [],
    });
  }
  return items;
}
export type OpenAdjudication = Awaited<ReturnType<typeof openAdjudications>>[number];
