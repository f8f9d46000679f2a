// The schemas the adjudications routes parse and answer with. Those the client also uses are
// defined in shared/schemas/ and re-exported here; server-only ones are defined here.
export { adjudicationListSchema } from "../../../shared/schemas/reviewing";
