// The submission form for a new exam or a draft: details first, then clips (which need the
// saved draft's id — dropping the first clip on a new exam saves the draft by itself), then
// the attestation and Submit.
import { useRef, useState, type BaseSyntheticEvent } from "react";
import { useForm, useWatch } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { useNavigate } from "react-router-dom";
import type { z } from "zod";
import type { Application } from "../../../../shared/schemas/applications";
import { examCreateSchema, type Exam, type ExamFieldsInput } from "../../../../shared/schemas/exams";
import { Button } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";
import { applyServerFieldErrors, errorMessage, isApiError } from "../../../lib/api-errors";
import { nowToTheMinute } from "../../../lib/datetime-local";
import { useCreateExam, useSubmitExam, useUpdateExam, type ExamFieldsBody } from "../api/exams";
import { useClipUploads } from "../api/clip-uploads";
import { ClipDropzone } from "./clip-dropzone";
import { ClipRow } from "./clip-row";
import { ExamDetailsFields } from "./exam-details-fields";
import { SubmitPanel } from "./submit-panel";
import { UploadRow } from "./upload-row";

type Output = z.output<typeof examCreateSchema>;

const FIELDS = ["applicationCode", "performedAt", "setting", "transducer", "preset", "indication", "findings", "encounterRef"] as const;

function valuesOf(exam: Exam | undefined): Partial<ExamFieldsInput> {
  if (!exam) return { applicationCode: "", performedAt: nowToTheMinute(), preset: "", indication: "", findings: [] };
  return {
    applicationCode: exam.application.code,
    performedAt: exam.performedAt,
    setting: exam.setting,
    transducer: exam.transducer,
    preset: exam.preset,
    indication: exam.indication,
    findings: exam.findings,
  };
}

function messageOf(error: unknown): string {
  if (isApiError(error, 409) && error.code === "exam_not_draft") return "This exam was already submitted and can no longer be changed.";
  return errorMessage(error, "Saving did not work. Please try again.");
}

export function ExamEditor({ exam, applications }: { exam?: Exam; applications: Application[] }) {
  const navigate = useNavigate();
  const create = useCreateExam();
  const update = useUpdateExam();
  const submitExam = useSubmitExam();
  const { uploads, start, retry, dismiss } = useClipUploads(exam?.id);
  const [formError, setFormError] = useState<string | null>(null);
  const [saved, setSaved] = useState<string | null>(null);
  const [waitingFiles, setWaitingFiles] = useState<File[]>([]);
  const filesToSend = useRef<File[]>([]);

  const form = useForm<ExamFieldsInput, unknown, Output>({
    resolver: zodResolver(examCreateSchema),
    defaultValues: valuesOf(exam),
  });
  const { handleSubmit, setError, reset, control, formState } = form;

  const persist = async (values: Output): Promise<Exam | null> => {
    setFormError(null);
    setSaved(null);
    // An empty reference field keeps the one kept (it is never sent back to fill it in).
    const body: ExamFieldsBody = { ...values, encounterRef: values.encounterRef ? values.encounterRef : undefined };
    try {
      const result = exam ? await update.mutateAsync({ id: exam.id, body }) : await create.mutateAsync(body);
      reset(valuesOf(result));
      return result;
    } catch (error) {
      if (!applyServerFieldErrors(error, setError, FIELDS)) setFormError(messageOf(error));
      return null;
    }
  };

  const saveValues = async (values: Output) => {
    const result = await persist(values);
    if (!result) return;
    const files = filesToSend.current;
    filesToSend.current = [];
    setWaitingFiles([]);
    if (files.length) start(result.id, files);
    if (!exam) {
      navigate(`/exams/${result.id}/edit`, {
        replace: true,
        state: { notice: files.length ? "Draft saved. Your clips are uploading." : "Draft saved. Now add the clips." },
      });
    } else {
      setSaved("Draft saved.");
    }
  };
  // handleSubmit is called inside the handler: the pending files live in a ref, read only then.
  const onSave = (e?: BaseSyntheticEvent) => handleSubmit(saveValues)(e);

  const onFiles = (files: File[]) => {
    if (exam) {
      start(exam.id, files);
      return;
    }
    // Clips belong to a saved exam: save the draft first, then send the files.
    filesToSend.current = [...filesToSend.current, ...files];
    setWaitingFiles(filesToSend.current);
    void onSave();
  };

  const onSubmitExam = async () => {
    if (!exam) return;
    setFormError(null);
    if (formState.isDirty) {
      let ok = false;
      await handleSubmit(async (values) => {
        ok = !!(await persist(values));
      })();
      if (!ok) return;
    }
    // Awaited rather than an onSuccess option: the cached exam turns "submitted" first, which
    // unmounts this editor, and per-call callbacks of an unmounted observer never run.
    try {
      const result = await submitExam.mutateAsync(exam.id);
      navigate(`/exams/${result.id}`, { state: { notice: "Submitted for review. The exam is now read-only." } });
    } catch {
      // Shown by the panel from the mutation's error.
    }
  };

  const appCode = useWatch({ control, name: "applicationCode" });
  const findings = useWatch({ control, name: "findings" }) ?? [];
  const application = applications.find((a) => a.code === appCode);
  const findingsMissing = application ? application.findings.filter((f) => !findings.some((r) => r.key === f.key)).length : 0;
  const views = applications.find((a) => a.code === exam?.application.code)?.views ?? [];
  const saving = create.isPending || update.isPending;
  const uploadingCount = uploads.filter((u) => u.status === "uploading").length;

  return (
    <div className="space-y-6">
      <section aria-labelledby="details-heading" className="rounded-lg border border-slate-200 bg-white p-5">
        <h2 id="details-heading" className="mb-4 text-lg font-semibold text-ink-950">
          Details
        </h2>
        <form onSubmit={onSave} noValidate className="space-y-6">
          <FormMessage message={formError} />
          <ExamDetailsFields form={form} applications={applications} hasEncounterRef={!!exam?.hasEncounterRef} />
          <div className="flex flex-wrap items-center gap-3 border-t border-slate-100 pt-4">
            <Button type="submit" variant={exam ? "secondary" : "primary"} busy={saving}>
              Save draft
            </Button>
            {exam && formState.isDirty ? <span className="text-sm text-slate-600">Unsaved changes</span> : null}
            <FormMessage tone="success" message={saved && !formState.isDirty ? saved : null} />
          </div>
        </form>
      </section>

      <section aria-labelledby="clips-heading" className="rounded-lg border border-slate-200 bg-white p-5">
        <h2 id="clips-heading" className="text-lg font-semibold text-ink-950">
          Clips
        </h2>
        <p className="mb-4 mt-1 text-sm text-slate-600">
          Each clip is checked by its content, stripped of metadata and made web-playable. Label each clip with its view. To black out burned-in text, open the
          exam page once a clip is ready.
        </p>
        <ClipDropzone onFiles={onFiles} disabled={saving && !exam} hint={exam ? undefined : "Adding the first clip saves the draft with the details above."} />
        {waitingFiles.length > 0 && !exam ? (
          <p role="status" className="mt-3 text-sm text-slate-700">
            {waitingFiles.length === 1 ? "1 file waits" : `${waitingFiles.length} files wait`} until the details above can be saved.
          </p>
        ) : null}
        {exam && (uploads.length > 0 || exam.clips.length > 0) ? (
          <ul className="mt-4 space-y-2" aria-label="Clips of this exam">
            {exam.clips.map((clip) => (
              <ClipRow key={clip.id} examId={exam.id} clip={clip} views={views} editable />
            ))}
            {uploads.map((item) => (
              <UploadRow key={item.key} item={item} onRetry={() => retry(item.key)} onDismiss={() => dismiss(item.key)} />
            ))}
          </ul>
        ) : exam ? (
          <p className="mt-3 text-sm text-slate-600">No clips yet.</p>
        ) : null}
      </section>

      {exam ? (
        <SubmitPanel
          exam={exam}
          uploading={uploadingCount}
          findingsMissing={findingsMissing}
          busy={submitExam.isPending}
          error={submitExam.isError ? messageOf(submitExam.error) : null}
          onSubmit={() => void onSubmitExam()}
        />
      ) : null}
    </div>
  );
}
