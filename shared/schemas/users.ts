// People of a program: invitations, roles, deactivation (Setup → People).
import { z } from "zod";
import { emailSchema, roleSchema } from "./auth";

export const rolesSchema = z
  .array(roleSchema)
  .min(1, "Choose at least one role")
  .transform((roles) => [...new Set(roles)]);

export const inviteSchema = z.object({
  email: emailSchema,
  name: z.string().trim().max(120).optional(),
  roles: rolesSchema,
});

export const updateRolesSchema = z.object({ roles: rolesSchema });

/** An operator name as compared: "Varga^Tobias" and "varga tobias" are the same person ("Tobias Varga" is not). */
export const normaliseOperatorName = (name: string) =>
  name
    .toUpperCase()
    .replace(/[\^,=]+/g, " ")
    .replace(/\s+/g, " ")
    .trim();

/**
 * The operator names a member's ultrasound machine writes into DICOM (Operators' Name), as
 * "Family^Given" or "Given Family"; received studies are matched to the one member who gave the
 * name. Up to 8 names (machines differ), each 1–64 characters.
 */
export const operatorNamesSchema = z.object({
  names: z
    .array(z.string().trim().min(1, "An operator name cannot be empty").max(64, "An operator name has at most 64 characters"), {
      error: "names must be a list of operator names",
    })
    .max(8, "Give at most 8 operator names")
    .transform((names) => [...new Set(names)]),
});

export const memberSchema = z.object({
  id: z.uuid(),
  name: z.string(),
  email: z.string(),
  roles: z.array(roleSchema),
  active: z.boolean(),
  joinedAt: z.string(),
  lastSignInAt: z.string().nullable(),
  /** The operator names this member's scans carry in DICOM (Operators' Name), matched on receipt. */
  dicomOperatorNames: z.array(z.string()),
});
export type Member = z.infer<typeof memberSchema>;
export const memberListSchema = z.object({ members: z.array(memberSchema) });
export type MemberList = z.infer<typeof memberListSchema>;
export const memberAnswerSchema = z.object({ member: memberSchema });
export type MemberAnswer = z.infer<typeof memberAnswerSchema>;

export const invitationSchema = z.object({
  id: z.uuid(),
  email: z.string(),
  roles: z.array(roleSchema),
  invitedBy: z.string().nullable(),
  createdAt: z.string(),
  expiresAt: z.string(),
  acceptedAt: z.string().nullable(),
  revokedAt: z.string().nullable(),
});
export type Invitation = z.infer<typeof invitationSchema>;
export const invitationListSchema = z.object({ invitations: z.array(invitationSchema) });
export type InvitationList = z.infer<typeof invitationListSchema>;
export const invitationAnswerSchema = z.object({ invitation: invitationSchema });
export type InvitationAnswer = z.infer<typeof invitationAnswerSchema>;

export const auditQuerySchema = z.object({
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).default(0),
  action: z.string().max(80).optional(),
});

export const auditEntrySchema = z.object({
  id: z.string(),
  at: z.string(),
  actor: z.string().nullable(),
  action: z.string(),
  entityType: z.string().nullable(),
  entityId: z.string().nullable(),
  ip: z.string().nullable(),
  details: z.record(z.string(), z.unknown()).nullable(),
});
export type AuditEntry = z.infer<typeof auditEntrySchema>;
/** One page of the audit log and the count of all entries that match. */
export const auditPageSchema = z.object({ entries: z.array(auditEntrySchema), total: z.number() });
export type AuditPage = z.infer<typeof auditPageSchema>;
