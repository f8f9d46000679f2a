// The schemas the users routes parse and answer with. Those the client also uses are
// defined in shared/schemas/ and re-exported here; server-only ones are defined here.
export { idParamsSchema } from "../../../shared/schemas/common";
export {
  invitationAnswerSchema,
  invitationListSchema,
  inviteSchema,
  memberAnswerSchema,
  memberListSchema,
  operatorNamesSchema,
  updateRolesSchema,
} from "../../../shared/schemas/users";
