// The schema the health route answers with (server only: the client never asks).
import { z } from "zod";

export const healthSchema = z.object({ ok: z.boolean(), db: z.enum(["up", "down"]) });
