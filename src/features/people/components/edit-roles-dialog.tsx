// Change one member's roles. The server refuses a change that would leave the program
// without an administrator; that refusal is explained here in plain words.
import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { updateRolesSchema, type Member } from "../../../../shared/schemas/users";
import { errorMessage, isApiError } from "../../../lib/api-errors";
import { Button } from "../../../components/ui/button";
import { Dialog } from "../../../components/ui/dialog";
import { FormMessage } from "../../../components/ui/form-message";
import { useUpdateRoles } from "../api/people";
import { RoleCheckboxes } from "./role-checkboxes";

export function EditRolesDialog({ member, onClose }: { member: Member | null; onClose: () => void }) {
  return (
    <Dialog open={member !== null} title={member ? `Roles of ${member.name}` : "Roles"} onClose={onClose}>
      {member ? <EditRolesForm key={member.id} member={member} onDone={onClose} /> : null}
    </Dialog>
  );
}

function EditRolesForm({ member, onDone }: { member: Member; onDone: () => void }) {
  const update = useUpdateRoles();
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    formState: { errors, isDirty },
  } = useForm({ resolver: zodResolver(updateRolesSchema), defaultValues: { roles: member.roles } });

  const onSubmit = handleSubmit(async ({ roles }) => {
    setFormError(null);
    try {
      await update.mutateAsync({ id: member.id, roles });
      onDone();
    } catch (error) {
      if ((isApiError(error, 400) || isApiError(error, 409)) && error.code === "last_admin") {
        setFormError("The program must keep at least one active administrator. Make someone else an administrator first.");
        return;
      }
      setFormError(errorMessage(error, "The roles could not be changed."));
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <p className="text-sm text-slate-700">{member.email}</p>
      <RoleCheckboxes registration={register("roles")} error={errors.roles?.message ?? errors.roles?.root?.message} />
      <FormMessage message={formError} />
      <div className="flex justify-end gap-2">
        <Button variant="secondary" onClick={onDone} disabled={update.isPending}>
          Cancel
        </Button>
        <Button type="submit" busy={update.isPending} disabled={!isDirty}>
          Save roles
        </Button>
      </div>
    </form>
  );
}
