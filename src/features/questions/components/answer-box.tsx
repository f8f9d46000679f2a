// The reviewer's answer box: a text area and "Send answer" (Ctrl+Enter sends too). A refused
// answer shows the server's message next to the field; on success the box clears and the
// thread refreshes (the mutation invalidates it).
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { Button } from "../../../components/ui/button";
import { Kbd } from "../../../components/ui/kbd";
import { FieldError } from "../../../components/ui/text-field";
import { FormMessage } from "../../../components/ui/form-message";
import { isApiError } from "../../../lib/api-errors";
import { answerSchema, usePostAnswer } from "../api/questions";

export function AnswerBox({ examId }: { examId: string }) {
  const post = usePostAnswer();
  const form = useForm<{ body: string }>({ resolver: zodResolver(answerSchema), defaultValues: { body: "" } });
  const error = form.formState.errors.body?.message;
  const sending = post.isPending;

  const onSubmit = form.handleSubmit(async ({ body }) => {
    try {
      await post.mutateAsync({ examId, body });
      form.reset({ body: "" });
      form.setFocus("body");
    } catch (err) {
      // The server's own words ({ error: { message } }) go next to the field.
      form.setError("body", { message: isApiError(err) ? err.message : "The answer could not be sent. Try again." });
      form.setFocus("body");
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-2" aria-busy={sending || undefined}>
      <label htmlFor="answer-body" className="block text-sm font-semibold text-ink-900">
        Your answer
      </label>
      <p id="answer-hint" className="text-sm text-slate-600">
        The clinician is told and reads it with their feedback. <Kbd>Ctrl</Kbd> + <Kbd>Enter</Kbd> sends.
      </p>
      <textarea
        id="answer-body"
        rows={4}
        readOnly={sending}
        aria-disabled={sending || undefined}
        aria-invalid={error ? true : undefined}
        aria-describedby={`answer-hint${error ? " answer-error" : ""}`}
        onKeyDown={(e) => {
          if (e.key === "Enter" && (e.ctrlKey || e.metaKey)) {
            e.preventDefault();
            if (!sending) void onSubmit();
          }
        }}
        className={
          "block w-full rounded-md border bg-white px-3 py-2 text-base text-ink-950 read-only:bg-paper-100 read-only:text-slate-600 " +
          "focus-visible:outline-2 focus-visible:outline-offset-1 focus-visible:outline-sea-600 " +
          (error ? "border-coral-600" : "border-slate-400")
        }
        {...form.register("body")}
      />
      <FieldError id="answer-error" message={error} />
      <FormMessage tone="success" message={post.isSuccess && !form.formState.isDirty ? "Answer sent." : null} />
      <Button type="submit" busy={sending}>
        {sending ? "Sending…" : "Send answer"}
      </Button>
    </form>
  );
}
