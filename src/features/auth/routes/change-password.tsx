// Change password while signed in. This session stays; the server signs out every other one.
import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { PASSWORD_MIN } from "../../../../shared/schemas/auth";
import { applyServerFieldErrors, isApiError } from "../../../lib/api-errors";
import { Button } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { PageHeader } from "../../../components/ui/page-header";
import { TextField } from "../../../components/ui/text-field";
import { useChangePassword } from "../api/auth";
import { changePasswordFormSchema } from "../components/password-schemas";

export default function ChangePasswordPage() {
  const change = useChangePassword();
  const [formError, setFormError] = useState<string | null>(null);
  const [done, setDone] = useState(false);
  const {
    register,
    handleSubmit,
    setError,
    reset,
    formState: { errors },
  } = useForm({
    resolver: zodResolver(changePasswordFormSchema),
    defaultValues: { currentPassword: "", newPassword: "", confirmPassword: "" },
  });

  const onSubmit = handleSubmit(async ({ currentPassword, newPassword }) => {
    setFormError(null);
    setDone(false);
    try {
      await change.mutateAsync({ currentPassword, newPassword });
      reset();
      setDone(true);
    } catch (error) {
      if (isApiError(error, 400) && error.code === "wrong_password") {
        setError("currentPassword", { type: "server", message: "This is not your current password" }, { shouldFocus: true });
        return;
      }
      if (applyServerFieldErrors(error, setError, ["currentPassword", "newPassword"])) return;
      setFormError(
        isApiError(error, 429)
          ? "Too many attempts. Please wait a few minutes, then try again."
          : error instanceof Error
            ? error.message
            : "The password could not be changed.",
      );
    }
  });

  return (
    <div className="max-w-md">
      <PageHeader title="Change password" description="You stay signed in here. Any other browser or device signed in to your account is signed out." />
      <form onSubmit={onSubmit} noValidate className="space-y-4">
        <FormMessage message={formError} />
        <FormMessage tone="success" message={done ? "Your password is changed. Other sessions have been signed out." : null} />
        <TextField
          label="Current password"
          type="password"
          autoComplete="current-password"
          error={errors.currentPassword?.message}
          {...register("currentPassword")}
        />
        <TextField
          label="New password"
          type="password"
          autoComplete="new-password"
          hint={`At least ${PASSWORD_MIN} characters.`}
          error={errors.newPassword?.message}
          {...register("newPassword")}
        />
        <TextField
          label="New password again"
          type="password"
          autoComplete="new-password"
          error={errors.confirmPassword?.message}
          {...register("confirmPassword")}
        />
        <Button type="submit" busy={change.isPending}>
          Change password
        </Button>
      </form>
    </div>
  );
}
