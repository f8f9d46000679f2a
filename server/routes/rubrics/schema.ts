// The schemas the rubrics routes parse and answer with. Those the client also uses are
// defined in shared/schemas/ and re-exported here; server-only ones are defined here.
export { idParamsSchema } from "../../../shared/schemas/common";
export { rubricAnswerSchema, rubricListSchema } from "../../../shared/schemas/rubrics";
export { rubricInputSchema } from "../../../shared/rubric/types";
