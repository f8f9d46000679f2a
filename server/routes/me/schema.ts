// The schemas the me routes parse and answer with. Those the client also uses are
// defined in shared/schemas/ and re-exported here; server-only ones are defined here.
export { idParamsSchema } from "../../../shared/schemas/common";
export { feedbackListSchema, feedbackSchema } from "../../../shared/schemas/feedback";
export { progressQuerySchema, progressSchema } from "../../../shared/schemas/progress";
