// The schemas the assignments routes parse and answer with. Those the client also uses are
// defined in shared/schemas/ and re-exported here; server-only ones are defined here.
export { idParamsSchema } from "../../../shared/schemas/common";
export { draftSavedSchema, reassignedSchema, reviewSubmittedSchema, workspaceSchema } from "../../../shared/schemas/reviewing";
export { reassignSchema, reviewDraftSchema, submitReviewSchema } from "../../../shared/schemas/reviews";
