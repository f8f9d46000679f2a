// The shared password schemas plus a "type it again" field, checked only in the browser.
import { z } from "zod";
import { acceptInvitationExistingSchema, acceptInvitationNewSchema, changePasswordSchema, resetPasswordSchema } from "../../../../shared/schemas/auth";

const MISMATCH = "The two passwords do not match";

export const resetPasswordFormSchema = resetPasswordSchema
  .extend({ confirmPassword: z.string().min(1, "Type the new password again") })
  .refine((v) => v.password === v.confirmPassword, { path: ["confirmPassword"], message: MISMATCH });

export const changePasswordFormSchema = changePasswordSchema
  .extend({ confirmPassword: z.string().min(1, "Type the new password again") })
  .refine((v) => v.newPassword === v.confirmPassword, { path: ["confirmPassword"], message: MISMATCH });

/**
 * Accepting an invitation: a new account chooses a password and types it twice; an
 * existing account proves itself with its current password, so there is nothing to repeat.
 */
export const acceptInvitationFormSchema = (existingUser: boolean) =>
  existingUser
    ? acceptInvitationExistingSchema.extend({ name: z.string(), confirmPassword: z.string() })
    : acceptInvitationNewSchema.extend({ confirmPassword: z.string() }).superRefine((v, ctx) => {
        if (!v.confirmPassword) ctx.addIssue({ code: "custom", path: ["confirmPassword"], message: "Type the password again" });
        else if (v.password !== v.confirmPassword) ctx.addIssue({ code: "custom", path: ["confirmPassword"], message: MISMATCH });
      });
