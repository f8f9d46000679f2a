// The schemas the queue routes parse and answer with. Those the client also uses are
// defined in shared/schemas/ and re-exported here; server-only ones are defined here.
export { queueOverviewSchema, workspaceSchema } from "../../../shared/schemas/reviewing";
export { queueNextSchema } from "../../../shared/schemas/reviews";
