// The schemas the notifications routes parse and answer with. Those the client also uses are
// defined in shared/schemas/ and re-exported here; server-only ones are defined here.
export { markNotificationsReadSchema, notificationsSchema } from "../../../shared/schemas/feedback";
