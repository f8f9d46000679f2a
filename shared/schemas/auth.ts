// Sign-in, sessions and passwords: used by the sign-in forms and the auth routes alike.
import { z } from "zod";
import { ROLES } from "../roles";

/** Minimum length of a new password (issue: at least 12 characters). */
export const PASSWORD_MIN = 12;

export const emailSchema = z
  .string()
  .trim()
  .min(1, "Enter an e-mail address")
  .max(254)
  .pipe(z.email("Enter a valid e-mail address"))
  .transform((s) => s.toLowerCase());

export const newPasswordSchema = z.string().min(PASSWORD_MIN, `Use at least ${PASSWORD_MIN} characters`).max(200, "Use at most 200 characters");

export const loginSchema = z.object({
  email: emailSchema,
  // Existing passwords are checked, not judged: no length rule here.
  password: z.string().min(1, "Enter your password").max(200),
  programId: z.uuid().optional(),
});

export const roleSchema = z.enum(ROLES);

export const sessionUserSchema = z.object({
  id: z.uuid(),
  name: z.string(),
  email: z.string(),
  programId: z.uuid(),
  programName: z.string(),
  roles: z.array(roleSchema),
});
export type SessionUser = z.infer<typeof sessionUserSchema>;

export const loginResponseSchema = z.object({ token: z.string(), user: sessionUserSchema });
export type LoginResponse = z.infer<typeof loginResponseSchema>;

/** GET /api/auth/me. */
export const meResponseSchema = z.object({ user: sessionUserSchema });
export type MeResponse = z.infer<typeof meResponseSchema>;

export const forgotPasswordSchema = z.object({ email: emailSchema });

export const resetPasswordSchema = z.object({
  token: z.string().min(20).max(200),
  password: newPasswordSchema,
});

export const changePasswordSchema = z.object({
  currentPassword: z.string().min(1, "Enter your current password").max(200),
  newPassword: newPasswordSchema,
});

/** Accepting as a new person: a name and a new password. */
export const acceptInvitationNewSchema = z.object({
  token: z.string().min(20).max(200),
  name: z.string().trim().min(1, "Enter your name").max(120),
  password: newPasswordSchema,
});

/** Accepting with an existing account: its current password proves who you are. */
export const acceptInvitationExistingSchema = z.object({
  token: z.string().min(20).max(200),
  name: z.string().trim().max(120).optional(),
  password: z.string().min(1, "Enter your current password").max(200),
});

/** What the accept route takes; which rules apply depends on whether the account exists. */
export const acceptInvitationSchema = acceptInvitationExistingSchema;

export const programChoiceSchema = z.object({ programId: z.uuid() });
export const myProgramsSchema = z.object({
  programs: z.array(z.object({ id: z.uuid(), name: z.string(), roles: z.array(z.enum(ROLES)), current: z.boolean() })),
});

export const invitationPreviewSchema = z.object({
  email: z.string(),
  programName: z.string(),
  roles: z.array(roleSchema),
  existingUser: z.boolean(),
  /** The name the inviter typed, to prefill the form. */
  name: z.string().nullable(),
});
export type InvitationPreview = z.infer<typeof invitationPreviewSchema>;
