// The schemas the roster routes parse and answer with. Those the client also uses are
// defined in shared/schemas/ and re-exported here; server-only ones are defined here.
export { idParamsSchema } from "../../../shared/schemas/common";
export { feedbackListSchema } from "../../../shared/schemas/feedback";
export { progressQuerySchema, progressSchema, rosterSchema } from "../../../shared/schemas/progress";
