// The schemas the follow-ups routes parse and answer with. Those the client also uses are
// defined in shared/schemas/ and re-exported here; server-only ones are defined here.
import { z } from "zod";
import { followUpStatusSchema } from "../../../shared/schemas/follow-ups";

export { idParamsSchema } from "../../../shared/schemas/common";
export { encounterRefSchema, followUpListSchema, followUpUpdatedSchema, followUpUpdateSchema } from "../../../shared/schemas/follow-ups";

/** GET /follow-ups?status=: one status, or every follow-up. */
export const followUpListQuerySchema = z.object({ status: followUpStatusSchema.optional() });
