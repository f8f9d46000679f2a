// Schemas only the auth routes use (the client reads none of these answers).
import { z } from "zod";

/** POST /auth/password/forgot answers this, whether or not the address exists. */
export const forgotAnswerSchema = z.object({ ok: z.literal(true) });

export const invitationTokenParamsSchema = z.object({ token: z.string().min(20).max(200) });
