// The schemas the reports routes parse and answer with. Those the client also uses are
// defined in shared/schemas/ and re-exported here; server-only ones are defined here.
export { credentialingReportQuerySchema } from "../../../shared/schemas/progress";
export { agreementReportQuerySchema, agreementReportSchema, programReportQuerySchema, programReportSchema } from "../../../shared/schemas/reports";
