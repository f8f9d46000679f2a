// Invite someone by e-mail with one or more roles. The server mails the link; the
// invitation then appears in the pending list until accepted, revoked or expired.
import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { inviteSchema } from "../../../../shared/schemas/users";
import { applyServerFieldErrors, errorMessage, isApiError } from "../../../lib/api-errors";
import { Button } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { TextField } from "../../../components/ui/text-field";
import { useInvite } from "../api/people";
import { RoleCheckboxes } from "./role-checkboxes";

export function InviteForm() {
  const invite = useInvite();
  const [formError, setFormError] = useState<string | null>(null);
  const [sent, setSent] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    reset,
    formState: { errors },
  } = useForm({
    resolver: zodResolver(inviteSchema),
    defaultValues: { email: "", name: "", roles: ["sonographer"] },
  });

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    setSent(null);
    try {
      await invite.mutateAsync({ email: values.email, roles: values.roles, ...(values.name ? { name: values.name } : {}) });
      reset();
      setSent(`Invitation sent to ${values.email}.`);
    } catch (error) {
      if (isApiError(error, 409) && error.code === "already_member") {
        setError("email", { type: "server", message: "This person is already a member of the program" }, { shouldFocus: true });
        return;
      }
      if (applyServerFieldErrors(error, setError, ["email", "name", "roles"])) return;
      setFormError(errorMessage(error, "The invitation could not be sent."));
    }
  });

  return (
    <section aria-labelledby="invite-heading" className="rounded-lg border border-slate-200 bg-white p-5">
      <h2 id="invite-heading" className="text-lg font-semibold text-ink-950">
        Invite someone
      </h2>
      <p className="mt-1 text-sm text-slate-600">They receive an e-mail with a link to set their name and password.</p>
      <form onSubmit={onSubmit} noValidate className="mt-4 space-y-4">
        <FormMessage message={formError} />
        <FormMessage tone="success" message={sent} />
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField label="E-mail" type="email" autoComplete="off" error={errors.email?.message} {...register("email")} />
          <TextField label="Name (optional)" autoComplete="off" error={errors.name?.message} {...register("name")} />
        </div>
        <RoleCheckboxes registration={register("roles")} error={errors.roles?.message ?? errors.roles?.root?.message} />
        <Button type="submit" busy={invite.isPending}>
          Send invitation
        </Button>
      </form>
    </section>
  );
}
