// What an exam looks like to its viewer. Whether the sonographer is named is decided here,
// once, from the policy (blinded reviewers will get a code and never a name or id).
import type { Clip, DicomFactsView, Exam, ExamListItem } from "../../shared/schemas/exams";
import type { FindingRead, Orientation } from "../../shared/catalogue";
import type { ApplicationGuide } from "../../shared/schemas/applications";

export interface ClipRow {
  id: string;
  view_key: string | null;
  kind: "video" | "still";
  state: Clip["state"];
  error: string | null;
  original_name: string;
  size_bytes: string | number;
  width: number | null;
  height: number | null;
  seconds: number | null;
  fps: number | null;
  frames: number | null;
  redactions: Clip["redactions"];
  precheck: unknown;
  dicom?: Record<string, unknown> | null;
  output_key: string | null;
  poster_key: string | null;
  strip_key: string | null;
  thumb_key: string | null;
  process_version: number;
  created_at: Date;
}

const mediaUrl = (clip: ClipRow, variant: string, present: string | null) =>
  present ? `/api/clips/${clip.id}/media/${variant}?v=${clip.process_version}` : null;

/** The DICOM facts a viewer sees (the stored facts also hold the SOP class and syntax UIDs). */
export function dicomFactsView(d: Record<string, unknown>): DicomFactsView {
  const n = (v: unknown) => (typeof v === "number" ? v : null);
  return {
    sopClass: String(d.sopClass ?? ""),
    transferSyntax: String(d.transferSyntax ?? ""),
    frames: n(d.frames) ?? 1,
    frameRate: n(d.frameRate),
    depthCm: n(d.depthCm),
    frequencyMHz: n(d.frequencyMHz),
    transducerType: typeof d.transducerType === "string" ? d.transducerType : null,
    // After the Clean Pixel Data Option the kept object says NO, whatever the machine said.
    burnedInAnnotation: d.cleanedPixels === true ? false : d.burnedInAnnotation === "YES" ? true : d.burnedInAnnotation === "NO" ? false : null,
  };
}

export function presentClip(c: ClipRow, opts: { forOwner: boolean }): Clip {
  const ready = c.state === "ready";
  return {
    id: c.id,
    view: c.view_key,
    kind: c.kind,
    state: c.state,
    error: c.error,
    originalName: opts.forOwner ? c.original_name : "",
    sizeBytes: Number(c.size_bytes),
    width: c.width,
    height: c.height,
    seconds: c.seconds,
    fps: c.fps,
    frames: c.frames,
    redactions: c.redactions ?? [],
    precheck: c.precheck ?? null,
    dicom: c.dicom ? dicomFactsView(c.dicom) : null,
    media: {
      video: ready && c.kind === "video" ? mediaUrl(c, "video", c.output_key) : null,
      image: ready && c.kind === "still" ? mediaUrl(c, "image", c.output_key) : null,
      poster: ready ? mediaUrl(c, "poster", c.poster_key) : null,
      strip: ready ? mediaUrl(c, "strip", c.strip_key) : null,
      thumb: ready ? mediaUrl(c, "thumb", c.thumb_key ?? c.poster_key) : null,
    },
    createdAt: c.created_at.toISOString(),
  };
}

/** The exam's application version's version, orientation convention and cautions. */
export const guideOf = (e: { application_id: string; app_version: number; app_orientation: Orientation; app_cautions: string[] }): ApplicationGuide => ({
  applicationId: e.application_id,
  version: e.app_version,
  orientation: e.app_orientation,
  cautions: e.app_cautions,
});

export interface ExamDetailRow {
  id: string;
  /** Sealed (server/auth/sealed.ts); never presented. */
  encounter_ref_sealed?: string | null;
  program_id: string;
  code: string;
  status: Exam["status"];
  app_code: string;
  app_name: string;
  application_id: string;
  app_version: number;
  app_orientation: Orientation;
  app_cautions: string[];
  performed_at: Date;
  setting: Exam["setting"];
  transducer: Exam["transducer"];
  preset: string;
  indication: string;
  sonographer_id: string;
  sonographer_name: string;
  submitted_at: Date | null;
  created_at: Date;
  updated_at: Date;
}

export function presentExam(
  e: ExamDetailRow,
  findings: { finding_key: string; read: FindingRead }[],
  clips: ClipRow[],
  opts: { identifySonographer: boolean; forOwner: boolean },
): Exam {
  return {
    id: e.id,
    code: e.code,
    status: e.status,
    application: { code: e.app_code, name: e.app_name },
    guide: guideOf(e),
    performedAt: e.performed_at.toISOString(),
    setting: e.setting,
    transducer: e.transducer,
    preset: e.preset,
    indication: e.indication,
    findings: findings.map((f) => ({ key: f.finding_key, read: f.read })),
    sonographer: opts.identifySonographer ? { id: e.sonographer_id, name: e.sonographer_name } : null,
    clips: clips.map((c) => presentClip(c, { forOwner: opts.forOwner })),
    submittedAt: e.submitted_at?.toISOString() ?? null,
    createdAt: e.created_at.toISOString(),
    updatedAt: e.updated_at.toISOString(),
    hasEncounterRef: opts.forOwner ? Boolean(e.encounter_ref_sealed) : null,
  };
}

export function presentExamListItem(r: {
  id: string;
  code: string;
  status: Exam["status"];
  app_code: string;
  app_name: string;
  performed_at: Date;
  setting: Exam["setting"];
  clip_count: string;
  ready_count: string;
  failed_count: string;
  poster_clip_id: string | null;
  poster_version: number | null;
  updated_at: Date;
}): ExamListItem {
  return {
    id: r.id,
    code: r.code,
    status: r.status,
    application: { code: r.app_code, name: r.app_name },
    performedAt: r.performed_at.toISOString(),
    setting: r.setting,
    clipCount: Number(r.clip_count),
    readyClipCount: Number(r.ready_count),
    failedClipCount: Number(r.failed_count),
    posterUrl: r.poster_clip_id ? `/api/clips/${r.poster_clip_id}/media/thumb?v=${r.poster_version}` : null,
    updatedAt: r.updated_at.toISOString(),
  };
}

/** An exam as one viewer may see it: the rows, and what the policy decided about naming and file names. */
export interface ExamView {
  exam: ExamDetailRow;
  findings: { finding_key: string; read: FindingRead }[];
  clips: ClipRow[];
  identifySonographer: boolean;
  forOwner: boolean;
}

export const presentExamView = (v: ExamView): Exam =>
  presentExam(v.exam, v.findings, v.clips, { identifySonographer: v.identifySonographer, forOwner: v.forOwner });
