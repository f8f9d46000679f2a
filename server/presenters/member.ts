// One member of a program as Setup → People shows them.
import type { Member } from "../../shared/schemas/users";
import type { MemberRow } from "../repositories/members";

export const presentMember = (r: MemberRow): Member => ({
  id: r.id,
  name: r.name,
  email: r.email,
  roles: r.roles,
  active: r.deactivated_at === null,
  joinedAt: r.created_at.toISOString(),
  lastSignInAt: r.last_sign_in_at?.toISOString() ?? null,
  dicomOperatorNames: r.dicom_operator_names ?? [],
});
