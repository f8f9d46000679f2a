// Accept an invitation (?token=…): shows which program, address and roles it is for,
// then asks for a name and password. The answer signs the person in when it can.
import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { useNavigate, useSearchParams } from "react-router-dom";
import { ROLE_LABELS } from "../../../../shared/roles";
import { PASSWORD_MIN, type InvitationPreview } from "../../../../shared/schemas/auth";
import { applyServerFieldErrors, errorMessage, isApiError } from "../../../lib/api-errors";
import { Button } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { ErrorState, LoadingState } from "../../../components/ui/states";
import { TextField } from "../../../components/ui/text-field";
import { useAcceptInvitation, useInvitationPreview } from "../api/auth";
import { AuthHeading } from "../components/auth-heading";
import { TextLink } from "../components/text-link";
import { acceptInvitationFormSchema } from "../components/password-schemas";

function DeadInvitation() {
  return (
    <>
      <AuthHeading title="This invitation is not valid" />
      <FormMessage message="The invitation link is incomplete, expired, withdrawn or already used. Ask your program's administrator to send a new one." />
      <p className="mt-6 text-sm">
        <TextLink to="/sign-in">Go to sign-in</TextLink>
      </p>
    </>
  );
}

export default function AcceptInvitationPage() {
  const [params] = useSearchParams();
  const token = params.get("token") ?? "";
  const preview = useInvitationPreview(token);

  if (!token) return <DeadInvitation />;
  if (preview.isPending) return <LoadingState label="Checking the invitation…" />;
  if (preview.isError) {
    if (isApiError(preview.error, 404) || isApiError(preview.error, 400)) return <DeadInvitation />;
    return <ErrorState error={preview.error} onRetry={() => void preview.refetch()} retrying={preview.isFetching} />;
  }
  return <AcceptForm token={token} invitation={preview.data} />;
}

function AcceptForm({ token, invitation }: { token: string; invitation: InvitationPreview }) {
  const navigate = useNavigate();
  const accept = useAcceptInvitation();
  const [formError, setFormError] = useState<string | null>(null);
  const [dead, setDead] = useState(false);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm({
    resolver: zodResolver(acceptInvitationFormSchema(invitation.existingUser)),
    defaultValues: { token, name: invitation.name ?? "", password: "", confirmPassword: "" },
  });

  if (dead || errors.token) return <DeadInvitation />;

  const onSubmit = handleSubmit(async ({ name, password }) => {
    setFormError(null);
    try {
      const result = await accept.mutateAsync({ token, name, password });
      if (result?.user) navigate("/", { replace: true });
      else navigate("/sign-in", { replace: true, state: { notice: `You have joined ${invitation.programName}. Sign in to continue.` } });
    } catch (error) {
      if (isApiError(error, 400) && error.code === "wrong_password") {
        setError("password", { type: "server", message: "This is not the current password of your account" }, { shouldFocus: true });
        return;
      }
      if (isApiError(error, 404) || (isApiError(error, 400) && error.code !== "validation_failed")) {
        setDead(true);
        return;
      }
      if (applyServerFieldErrors(error, setError, ["name", "password"])) return;
      setFormError(errorMessage(error, "The invitation could not be accepted."));
    }
  });

  return (
    <>
      <AuthHeading title={`Join ${invitation.programName}`}>You have been invited to Soundings.</AuthHeading>
      <dl className="mb-6 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 rounded-md bg-paper-200 px-4 py-3 text-sm">
        <dt className="font-semibold text-slate-700">Program</dt>
        <dd className="text-ink-950">{invitation.programName}</dd>
        <dt className="font-semibold text-slate-700">E-mail</dt>
        <dd className="break-all text-ink-950">{invitation.email}</dd>
        <dt className="font-semibold text-slate-700">Roles</dt>
        <dd className="text-ink-950">{invitation.roles.map((r) => ROLE_LABELS[r]).join(", ")}</dd>
      </dl>
      {invitation.existingUser ? (
        <p className="mb-4 text-sm text-slate-700">
          This address already has a Soundings account. Enter its current password to add {invitation.programName} to it.
        </p>
      ) : null}
      <form onSubmit={onSubmit} noValidate className="space-y-4">
        <FormMessage message={formError} />
        {invitation.existingUser ? null : <TextField label="Your name" autoComplete="name" error={errors.name?.message} {...register("name")} />}
        {invitation.existingUser ? (
          <TextField label="Current password" type="password" autoComplete="current-password" error={errors.password?.message} {...register("password")} />
        ) : (
          <>
            <TextField
              label="Password"
              type="password"
              autoComplete="new-password"
              hint={`At least ${PASSWORD_MIN} characters.`}
              error={errors.password?.message}
              {...register("password")}
            />
            <TextField
              label="Password again"
              type="password"
              autoComplete="new-password"
              error={errors.confirmPassword?.message}
              {...register("confirmPassword")}
            />
          </>
        )}
        <Button type="submit" className="w-full" busy={accept.isPending}>
          Accept and continue
        </Button>
      </form>
    </>
  );
}
