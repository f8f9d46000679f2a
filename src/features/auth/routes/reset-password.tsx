// Set a new password from the e-mailed link (?token=…). An expired or used link says so
// and offers to send a new one.
import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { useNavigate, useSearchParams } from "react-router-dom";
import { PASSWORD_MIN } from "../../../../shared/schemas/auth";
import { applyServerFieldErrors, errorMessage, isApiError } from "../../../lib/api-errors";
import { Button } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { TextField } from "../../../components/ui/text-field";
import { useResetPassword } from "../api/auth";
import { AuthHeading } from "../components/auth-heading";
import { TextLink } from "../components/text-link";
import { resetPasswordFormSchema } from "../components/password-schemas";

export default function ResetPasswordPage() {
  const [params] = useSearchParams();
  const token = params.get("token") ?? "";
  const navigate = useNavigate();
  const reset = useResetPassword();
  const [formError, setFormError] = useState<string | null>(null);
  const [linkDead, setLinkDead] = useState(false);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm({
    resolver: zodResolver(resetPasswordFormSchema),
    defaultValues: { token, password: "", confirmPassword: "" },
  });

  if (!token || linkDead || errors.token) {
    return (
      <>
        <AuthHeading title="This link does not work" />
        <FormMessage message="The link is incomplete, expired or already used. Links to set a password work once and only for a limited time." />
        <p className="mt-6 text-sm">
          <TextLink to="/forgot-password">Send me a new link</TextLink>
        </p>
      </>
    );
  }

  const onSubmit = handleSubmit(async ({ password }) => {
    setFormError(null);
    try {
      await reset.mutateAsync({ token, password });
      navigate("/sign-in", { replace: true, state: { notice: "Your new password is set. Sign in with it." } });
    } catch (error) {
      if (isApiError(error, 400) && error.code === "invalid_token") {
        setLinkDead(true);
        return;
      }
      if (applyServerFieldErrors(error, setError, ["password"])) return;
      setFormError(errorMessage(error, "The password could not be set."));
    }
  });

  return (
    <>
      <AuthHeading title="Set a new password">Choose a password of at least {PASSWORD_MIN} characters. A short sentence is easy to remember.</AuthHeading>
      <form onSubmit={onSubmit} noValidate className="space-y-4">
        <FormMessage message={formError} />
        <TextField label="New password" type="password" autoComplete="new-password" error={errors.password?.message} {...register("password")} />
        <TextField
          label="New password again"
          type="password"
          autoComplete="new-password"
          error={errors.confirmPassword?.message}
          {...register("confirmPassword")}
        />
        <Button type="submit" className="w-full" busy={reset.isPending}>
          Set password
        </Button>
      </form>
    </>
  );
}
