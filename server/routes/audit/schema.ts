// The schemas the audit routes parse and answer with. Those the client also uses are
// defined in shared/schemas/ and re-exported here; server-only ones are defined here.
export { auditPageSchema, auditQuerySchema } from "../../../shared/schemas/users";
