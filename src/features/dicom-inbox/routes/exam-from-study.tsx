// Make an exam of a received study: the exam's details as on Submit, and in one step every
// object of the study becomes a clip of the new draft (processed like an upload). The draft
// then opens for labelling views, redaction and submission.
import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { Link, useNavigate, useParams } from "react-router-dom";
import { useQuery } from "@tanstack/react-query";
import type { z } from "zod";
import type { Application } from "../../../../shared/schemas/applications";
import { examCreateSchema, type ExamFieldsInput } from "../../../../shared/schemas/exams";
import { PageHeader } from "../../../components/ui/page-header";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { Button } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { applicationsQuery } from "../../../lib/catalogue";
import { applyServerFieldErrors, errorMessage, isApiError } from "../../../lib/api-errors";
import { nowToTheMinute } from "../../../lib/datetime-local";
import { ExamDetailsFields } from "../../exams";
import { inboxQuery, useExamFromStudy, type InboxStudy } from "../api/inbox";
import { StudyPreview } from "../components/study-preview";

type Output = z.output<typeof examCreateSchema>;
const FIELDS = ["applicationCode", "performedAt", "setting", "transducer", "preset", "indication", "findings"] as const;

export default function ExamFromStudyPage() {
  const { id } = useParams();
  const list = useQuery(inboxQuery);
  const apps = useQuery(applicationsQuery);
  const study = list.data?.find((s) => s.id === id);
  return (
    <div className="space-y-6">
      <PageHeader
        eyebrow="Received studies"
        title="Make an exam of a received study"
        description="Describe the scan and record your read as on Submit. Every object of the study becomes a clip of the new draft."
      />
      {list.isPending || apps.isPending ? (
        <LoadingState label="Loading the study…" />
      ) : list.isError || apps.isError ? (
        <ErrorState
          error={list.error ?? apps.error}
          onRetry={() => void Promise.all([list.refetch(), apps.refetch()])}
          retrying={list.isFetching || apps.isFetching}
        />
      ) : !study ? (
        <EmptyState title="This study is not in your received studies" action={<Link to="/received">Back to received studies</Link>}>
          It may have been made into an exam already, or claimed by someone else.
        </EmptyState>
      ) : (
        <>
          <StudyPreview study={study} />
          <ExamFromStudyForm study={study} applications={apps.data.applications} />
        </>
      )}
    </div>
  );
}

function ExamFromStudyForm({ study, applications }: { study: InboxStudy; applications: Application[] }) {
  const navigate = useNavigate();
  const make = useExamFromStudy();
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<ExamFieldsInput, unknown, Output>({
    resolver: zodResolver(examCreateSchema),
    defaultValues: { applicationCode: "", performedAt: nowToTheMinute(), preset: "", indication: "", findings: [] },
  });
  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      const exam = await make.mutateAsync({ id: study.id, body: values });
      const n = study.objects.length;
      navigate(`/exams/${exam.id}/edit`, {
        replace: true,
        state: { notice: `Draft made from the received study: ${n} ${n === 1 ? "clip is" : "clips are"} being processed. Label each clip with its view.` },
      });
    } catch (error) {
      if (isApiError(error, 409)) setFormError("Someone else has claimed this study, or it was made into an exam already.");
      else if (!applyServerFieldErrors(error, form.setError, FIELDS)) setFormError(errorMessage(error, "The exam could not be made. Please try again."));
    }
  });
  return (
    <section aria-labelledby="details-heading" className="rounded-lg border border-slate-200 bg-white p-5">
      <h2 id="details-heading" className="mb-4 text-lg font-semibold text-ink-950">
        Details
      </h2>
      <form onSubmit={(e) => void onSubmit(e)} noValidate className="space-y-6">
        <FormMessage message={formError} />
        <ExamDetailsFields form={form} applications={applications} />
        <div className="flex flex-wrap items-center gap-3 border-t border-slate-100 pt-4">
          <Button type="submit" busy={make.isPending}>
            Make draft exam with {study.objects.length} {study.objects.length === 1 ? "clip" : "clips"}
          </Button>
          <Link to="/received" className="text-sm text-sea-700 underline-offset-2 hover:underline">
            Cancel
          </Link>
        </div>
      </form>
    </section>
  );
}
