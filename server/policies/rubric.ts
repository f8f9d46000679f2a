// What may happen to a rubric version given its status: a draft changes in place and can be
// published; a published version changes only into its next version; an archived one never
// changes (its reviews keep their scores).
import { HttpError } from "../http/errors";
import type { Rubric } from "../../shared/rubric/types";

type Status = Rubric["status"];

export function assertEditable(status: Status): void {
  if (status === "archived") throw new HttpError(409, "rubric_archived", "An archived version cannot change; edit the current version instead");
}

export function assertPublishable(status: Status): void {
  if (status !== "draft") throw new HttpError(409, "not_draft", "Only a draft can be published");
}

export function assertArchivable(status: Status): void {
  if (status === "archived") throw new HttpError(409, "already_archived", "This version is already archived");
}
