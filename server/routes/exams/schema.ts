// The schemas the exams routes parse and answer with. Those the client also uses are
// defined in shared/schemas/ and re-exported here; server-only ones are defined here.
export { idParamsSchema } from "../../../shared/schemas/common";
export {
  clipUploadResponseSchema,
  examCreateSchema,
  examListQuerySchema,
  examListResponseSchema,
  examResponseSchema,
  examUpdateSchema,
  submitExamSchema,
} from "../../../shared/schemas/exams";
export { acknowledgementSchema, messageThreadSchema, postedMessageSchema } from "../../../shared/schemas/feedback";
export { confirmationsInputSchema, confirmationsSchema } from "../../../shared/schemas/progress";
export { adjudicatedSchema } from "../../../shared/schemas/reviewing";
export { adjudicateSchema, messageInputSchema } from "../../../shared/schemas/reviews";
