// The schemas the applications routes parse and answer with. Those the client also uses are
// defined in shared/schemas/ and re-exported here; server-only ones are defined here.
export { idParamsSchema } from "../../../shared/schemas/common";
export {
  applicationAnswerSchema,
  applicationInputSchema,
  applicationListSchema,
  applicationVersionListSchema,
  newApplicationSchema,
} from "../../../shared/schemas/applications";
