// Uploads in flight, per exam. Kept outside React so an upload keeps going (and its progress
// stays visible) when the page changes from "new exam" to "edit draft" or the user moves
// around the app; once the server has accepted a file it becomes a clip of the exam query.
import { useCallback, useSyncExternalStore } from "react";
import { useQueryClient, type QueryClient } from "@tanstack/react-query";
import type { z } from "zod";
import type { clipUploadResponseSchema } from "../../../../shared/schemas/exams";
import { errorMessage, isApiError } from "../../../lib/api-errors";
import { uploadFile } from "../../../lib/upload";
import { examKeys, mergeClip } from "./exams";
import { queryKeys } from "../../../lib/query-keys";

export interface UploadItem {
  key: string;
  examId: string;
  file: File;
  /** 0–1 of the bytes sent. */
  progress: number;
  status: "uploading" | "refused";
  error: string | null;
  /** Worth sending again (the connection or the server failed), unlike a refused file. */
  retryable: boolean;
}

let items: UploadItem[] = [];
const listeners = new Set<() => void>();
let counter = 0;

function emit(next: UploadItem[]) {
  items = next;
  for (const l of listeners) l();
}

function patch(key: string, change: Partial<UploadItem>) {
  emit(items.map((i) => (i.key === key ? { ...i, ...change } : i)));
}

function subscribe(listener: () => void) {
  listeners.add(listener);
  return () => listeners.delete(listener);
}

async function run(queryClient: QueryClient, item: UploadItem) {
  try {
    const answer = await uploadFile<z.infer<typeof clipUploadResponseSchema>>(`/exams/${item.examId}/clips`, item.file, {
      onProgress: (share) => patch(item.key, { progress: share }),
    });
    mergeClip(queryClient, item.examId, answer.clip);
    emit(items.filter((i) => i.key !== item.key));
    await Promise.all([queryClient.invalidateQueries({ queryKey: examKeys.all }), queryClient.invalidateQueries({ queryKey: queryKeys.home })]);
  } catch (error) {
    const status = isApiError(error) ? error.status : 0;
    patch(item.key, {
      status: "refused",
      error: errorMessage(error, "The upload did not work."),
      retryable: status === 0 || status >= 500 || status === 429,
    });
  }
}

/** The uploads of one exam and the actions on them. */
export function useClipUploads(examId: string | undefined) {
  const queryClient = useQueryClient();
  const all = useSyncExternalStore(subscribe, () => items);
  const mine = examId ? all.filter((i) => i.examId === examId) : [];

  const start = useCallback(
    (targetExamId: string, files: File[]) => {
      const added = files.map<UploadItem>((file) => ({
        key: `upload-${++counter}`,
        examId: targetExamId,
        file,
        progress: 0,
        status: "uploading",
        error: null,
        retryable: false,
      }));
      emit([...items, ...added]);
      for (const item of added) void run(queryClient, item);
    },
    [queryClient],
  );

  const retry = useCallback(
    (key: string) => {
      const item = items.find((i) => i.key === key);
      if (!item) return;
      const again = { ...item, progress: 0, status: "uploading" as const, error: null };
      patch(key, again);
      void run(queryClient, again);
    },
    [queryClient],
  );

  const dismiss = useCallback((key: string) => emit(items.filter((i) => i.key !== key)), []);

  return { uploads: mine, start, retry, dismiss };
}
