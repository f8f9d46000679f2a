// The schemas the home routes parse and answer with. Those the client also uses are
// defined in shared/schemas/ and re-exported here; server-only ones are defined here.
export { homeSchema } from "../../../shared/schemas/home";
