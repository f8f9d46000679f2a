// Answers of Setup → Rubrics: the list of versions and one version (rubricSchema, in
// shared/rubric/types.ts, beside the criteria it is made of).
import { z } from "zod";
import { rubricSchema } from "../rubric/types";

/** One version in the list: no criteria (always empty here; GET /rubrics/:id has them), with counts. */
export const rubricListItemSchema = rubricSchema.extend({
  criteria: z.tuple([]),
  criteriaCount: z.number().int().nonnegative(),
  /** Reviews scored under this version. */
  reviewCount: z.number().int().nonnegative(),
});
export type RubricListItem = z.infer<typeof rubricListItemSchema>;

export const rubricListSchema = z.object({ rubrics: z.array(rubricListItemSchema) });
export const rubricAnswerSchema = z.object({ rubric: rubricSchema });
