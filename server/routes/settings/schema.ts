// The schemas the settings routes parse and answer with. Those the client also uses are
// defined in shared/schemas/ and re-exported here; server-only ones are defined here.
export { programSettingsUpdateSchema } from "../../../shared/schemas/reviews";
export { settingsAnswerSchema } from "../../../shared/schemas/settings";
