// The shared password schemas plus a "type it again" field, checked only in the browser.
import { z } from "zod";
import { acceptInvitationSchema, changePasswordSchema, resetPasswordSchema } from "../../../../shared/schemas/auth";

const MISMATCH = "The two passwords do not match";

export const resetPasswordFormSchema = resetPasswordSchema
  .extend({ confirmPassword: z.string().min(1, "Type the new password again") })
  .refine((v) => v.password === v.confirmPassword, { path: ["confirmPassword"], message: MISMATCH });

export const changePasswordFormSchema = changePasswordSchema
  .extend({ confirmPassword: z.string().min(1, "Type the new password again") })
  .refine((v) => v.newPassword === v.confirmPassword, { path: ["confirmPassword"], message: MISMATCH });

export const acceptInvitationFormSchema = acceptInvitationSchema
  .extend({ confirmPassword: z.string().min(1, "Type the password again") })
  .refine((v) => v.password === v.confirmPassword, { path: ["confirmPassword"], message: MISMATCH });
