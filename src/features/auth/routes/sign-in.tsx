// Sign-in: e-mail and password. Wrong credentials and rate limiting get a form-level
// message; field problems sit next to their fields.
import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { useLocation, useNavigate, useSearchParams } from "react-router-dom";
import { loginSchema } from "../../../../shared/schemas/auth";
import { applyServerFieldErrors, errorMessage, isApiError } from "../../../lib/api-errors";
import { safeNext } from "../../../lib/safe-next";
import { Button } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { TextField } from "../../../components/ui/text-field";
import { useSignIn } from "../api/auth";
import { AuthHeading } from "../components/auth-heading";
import { TextLink } from "../components/text-link";

function messageFor(error: unknown): string {
  if (isApiError(error, 401)) return "E-mail or password is incorrect.";
  if (isApiError(error, 429)) return "Too many sign-in attempts. Please wait a few minutes, then try again.";
  return errorMessage(error, "Signing in did not work. Please try again.");
}

export default function SignInPage() {
  const [params] = useSearchParams();
  const location = useLocation();
  const navigate = useNavigate();
  const signIn = useSignIn();
  const [formError, setFormError] = useState<string | null>(null);
  const notice = (location.state as { notice?: string } | null)?.notice ?? null;

  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm({
    resolver: zodResolver(loginSchema),
    defaultValues: { email: "", password: "" },
  });

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    try {
      await signIn.mutateAsync({ email: values.email, password: values.password });
      navigate(safeNext(params.get("next")), { replace: true });
    } catch (error) {
      if (applyServerFieldErrors(error, setError, ["email", "password"])) return;
      setFormError(messageFor(error));
    }
  });

  return (
    <>
      <AuthHeading title="Sign in">Use the e-mail address your program invited.</AuthHeading>
      {notice && !formError ? (
        <div className="mb-4">
          <FormMessage tone="success" message={notice} />
        </div>
      ) : null}
      <form onSubmit={onSubmit} noValidate className="space-y-4">
        <FormMessage message={formError} />
        <TextField label="E-mail" type="email" autoComplete="username" error={errors.email?.message} {...register("email")} />
        <TextField label="Password" type="password" autoComplete="current-password" error={errors.password?.message} {...register("password")} />
        <Button type="submit" className="w-full" busy={signIn.isPending}>
          Sign in
        </Button>
      </form>
      <p className="mt-6 text-sm">
        <TextLink to="/forgot-password">Forgot password?</TextLink>
      </p>
    </>
  );
}
