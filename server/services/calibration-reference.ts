// Checks a reference answer against what a reviewer of the exam would be asked: the criteria
// of the rubric the calibration reads use (for the exam's application) and the application's
// findings. A reference may be partial (only the given keys are compared), but what it gives
// must be a valid answer.
import type { Criterion } from "../../shared/rubric/types";
import { scoreIssues, type ScoreIssue } from "../../shared/rubric/logic";
import type { ReferenceAnswer } from "../../shared/schemas/calibration";

/** Problems with one exam's reference answer; paths are relative to the answer ("scores.depth", "reads.0.key"). */
export function referenceIssues(
  criteria: Criterion[],
  applicationCode: string,
  rubricVersion: number,
  findingKeys: readonly string[],
  reference: ReferenceAnswer,
): ScoreIssue[] {
  const given = Object.keys(reference.scores);
  if (given.length === 0 && reference.reads.length === 0) {
    return [{ path: "reference", message: "Give at least one score or finding read, or leave the reference answer out" }];
  }
  // Missing criteria are allowed (a partial reference); unknown keys and invalid values are not.
  const issues = scoreIssues(criteria, applicationCode, reference.scores, rubricVersion).filter((i) => given.includes(i.path.slice("scores.".length)));
  const known = new Set(findingKeys);
  const seen = new Set<string>();
  reference.reads.forEach((r, j) => {
    if (!known.has(r.key)) issues.push({ path: `reads.${j}.key`, message: `"${r.key}" is not a finding of this application` });
    else if (seen.has(r.key)) issues.push({ path: `reads.${j}.key`, message: `"${r.key}" is read twice` });
    seen.add(r.key);
  });
  return issues;
}
