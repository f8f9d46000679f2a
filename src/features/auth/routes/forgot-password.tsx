// Ask for a password link. The server answers the same way whether or not the address
// is known, so the page never reveals who has an account.
import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { forgotPasswordSchema } from "../../../../shared/schemas/auth";
import { applyServerFieldErrors, isApiError } from "../../../lib/api-errors";
import { Button } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { TextField } from "../../../components/ui/text-field";
import { useForgotPassword } from "../api/auth";
import { AuthHeading } from "../components/auth-heading";
import { TextLink } from "../components/text-link";

export default function ForgotPasswordPage() {
  const forgot = useForgotPassword();
  const [sentTo, setSentTo] = useState<string | null>(null);
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm({ resolver: zodResolver(forgotPasswordSchema), defaultValues: { email: "" } });

  const onSubmit = handleSubmit(async ({ email }) => {
    setFormError(null);
    try {
      await forgot.mutateAsync({ email });
      setSentTo(email);
    } catch (error) {
      if (applyServerFieldErrors(error, setError, ["email"])) return;
      setFormError(
        isApiError(error, 429)
          ? "Too many requests. Please wait a few minutes, then try again."
          : error instanceof Error
            ? error.message
            : "The request did not go through.",
      );
    }
  });

  if (sentTo) {
    return (
      <>
        <AuthHeading title="Check your e-mail" />
        <FormMessage
          tone="success"
          message={`If ${sentTo} belongs to a Soundings account, a link to set a new password is on its way. The link works once and expires after a while.`}
        />
        <p className="mt-6 text-sm">
          <TextLink to="/sign-in">Back to sign-in</TextLink>
        </p>
      </>
    );
  }

  return (
    <>
      <AuthHeading title="Forgot password">Enter your e-mail address and we will send you a link to set a new password.</AuthHeading>
      <form onSubmit={onSubmit} noValidate className="space-y-4">
        <FormMessage message={formError} />
        <TextField label="E-mail" type="email" autoComplete="email" error={errors.email?.message} {...register("email")} />
        <Button type="submit" className="w-full" busy={forgot.isPending}>
          Send the link
        </Button>
      </form>
      <p className="mt-6 text-sm">
        <TextLink to="/sign-in">Back to sign-in</TextLink>
      </p>
    </>
  );
}
