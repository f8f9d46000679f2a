// The schemas the auth routes parse and answer with. Those the client also uses are defined in
// shared/schemas/ and re-exported here; the two below are server-only.
import { z } from "zod";

export {
  acceptInvitationSchema,
  changePasswordSchema,
  forgotPasswordSchema,
  invitationPreviewSchema,
  loginResponseSchema,
  loginSchema,
  meResponseSchema,
  myProgramsSchema,
  programChoiceSchema,
  resetPasswordSchema,
} from "../../../shared/schemas/auth";

/** POST /auth/password/forgot answers this, whether or not the address exists. */
export const forgotAnswerSchema = z.object({ ok: z.literal(true) });

export const invitationTokenParamsSchema = z.object({ token: z.string().min(20).max(200) });
