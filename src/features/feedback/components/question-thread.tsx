// Questions about the feedback and their answers, oldest first, with the box to ask one.
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { messageInputSchema } from "../../../../shared/schemas/reviews";
import { Button } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { FieldError } from "../../../components/ui/text-field";
import { formatDateTime } from "../../../lib/format";
import { usePostQuestion, type Feedback } from "../api/feedback";

export function QuestionThread({ examId, messages }: { examId: string; messages: Feedback["messages"] }) {
  const post = usePostQuestion();
  const form = useForm<{ body: string }>({ resolver: zodResolver(messageInputSchema), defaultValues: { body: "" } });
  const error = form.formState.errors.body?.message;

  const onSubmit = form.handleSubmit(async ({ body }) => {
    try {
      await post.mutateAsync({ examId, body });
      form.reset({ body: "" });
    } catch {
      // Shown below from post.error.
    }
  });

  return (
    <div>
      {messages.length === 0 ? (
        <p className="text-sm text-slate-600">No questions yet.</p>
      ) : (
        <ol className="space-y-3" aria-label="Messages">
          {messages.map((m) => (
            <li
              key={m.id}
              className={`rounded-md border px-3 py-2 text-sm ${m.author === "you" ? "border-sea-200 bg-sea-50" : "border-slate-200 bg-paper-50"}`}
            >
              <p className="text-xs text-slate-600">
                <span className="font-semibold text-ink-900">{m.author === "you" ? "You" : m.author}</span> ·{" "}
                <span className="tabular-nums">{formatDateTime(m.at)}</span>
              </p>
              <p className="mt-1 whitespace-pre-line text-ink-900">{m.body}</p>
            </li>
          ))}
        </ol>
      )}
      <form onSubmit={onSubmit} noValidate className="mt-4 space-y-2">
        <label htmlFor="question-body" className="block text-sm font-semibold text-ink-900">
          Ask a question about this feedback
        </label>
        <p id="question-hint" className="text-sm text-slate-600">
          The reviewers of this exam are told and can answer here.
        </p>
        <textarea
          id="question-body"
          rows={3}
          aria-invalid={error ? true : undefined}
          aria-describedby={`question-hint${error ? " question-error" : ""}`}
          className={
            "block w-full rounded-md border bg-white px-3 py-2 text-base text-ink-950 focus-visible:outline-2 focus-visible:outline-offset-1 focus-visible:outline-sea-600 " +
            (error ? "border-coral-600" : "border-slate-400")
          }
          {...form.register("body")}
        />
        <FieldError id="question-error" message={error} />
        <FormMessage message={post.isError ? post.error.message : null} />
        <Button type="submit" variant="secondary" busy={post.isPending}>
          Send question
        </Button>
      </form>
    </div>
  );
}
