// Who can be calibrated: active reviewers of the program, at least two of them (agreement
// needs two readers).
import { HttpError } from "../http/errors";

const reviewerError = (message: string) => new HttpError(400, "validation_failed", `reviewerIds: ${message}`, [{ path: "reviewerIds", message }]);

/** `found` are the active reviewers among the `requested` ids (all active reviewers when none were requested). */
export function assertCalibrationReviewers(requested: string[] | undefined, found: string[]): void {
  if (requested && found.length !== new Set(requested).size) throw reviewerError("every id must be an active reviewer of this program");
  if (found.length < 2) throw reviewerError("calibration needs at least two reviewers");
}
