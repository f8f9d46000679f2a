// The schemas the clips routes parse and answer with. Those the client also uses are
// defined in shared/schemas/ and re-exported here; server-only ones are defined here.
import { z } from "zod";
import { MEDIA_VARIANTS } from "../../services/clips";

export { idParamsSchema } from "../../../shared/schemas/common";
export { clipResponseSchema, clipUpdateSchema } from "../../../shared/schemas/exams";

/** GET /clips/:id/media/:variant: which clip, and which of its processed files. */
export const clipMediaParamsSchema = z.object({ id: z.uuid(), variant: z.enum(MEDIA_VARIANTS) });
