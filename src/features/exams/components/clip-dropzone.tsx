// Where clips come in: drop files on the area or choose them with the picker, several at once.
// The picker is a real labelled file input, so the keyboard path is the browser's own.
import { useId, useRef, useState, type DragEvent } from "react";
import { Upload } from "lucide-react";
import { buttonClasses } from "../../../components/ui/button";

const ACCEPT =
  "video/mp4,video/quicktime,video/x-m4v,video/x-msvideo,video/webm,video/x-matroska,image/jpeg,image/png,application/dicom,.mp4,.mov,.m4v,.avi,.webm,.mkv,.jpg,.jpeg,.png,.dcm,.dicom";

export function ClipDropzone({ onFiles, disabled, hint }: { onFiles: (files: File[]) => void; disabled?: boolean; hint?: string }) {
  const inputId = useId();
  const inputRef = useRef<HTMLInputElement>(null);
  const [over, setOver] = useState(false);

  const onDrop = (e: DragEvent) => {
    e.preventDefault();
    setOver(false);
    if (disabled) return;
    const files = Array.from(e.dataTransfer.files);
    if (files.length) onFiles(files);
  };

  return (
    <div
      onDragOver={(e) => {
        e.preventDefault();
        if (!disabled) setOver(true);
      }}
      onDragLeave={() => setOver(false)}
      onDrop={onDrop}
      className={
        "rounded-lg border-2 border-dashed px-6 py-8 text-center transition-colors " +
        (over ? "border-sea-500 bg-sea-50" : "border-slate-300 bg-white") +
        (disabled ? " opacity-60" : "")
      }
    >
      <Upload aria-hidden="true" className="mx-auto size-6 text-slate-500" />
      <p className="mt-2 text-sm font-semibold text-ink-900">Drop clips here</p>
      <p className="mt-0.5 text-sm text-slate-600">
        MP4, MOV, M4V, AVI, WebM or MKV video; JPEG or PNG stills; DICOM ultrasound images and cine loops (de-identified on arrival). Several at once is fine.
      </p>
      <input
        ref={inputRef}
        id={inputId}
        type="file"
        multiple
        accept={ACCEPT}
        disabled={disabled}
        className="peer sr-only"
        onChange={(e) => {
          const files = Array.from(e.target.files ?? []);
          e.target.value = "";
          if (files.length) onFiles(files);
        }}
      />
      <label
        htmlFor={inputId}
        className={buttonClasses(
          "secondary",
          "md",
          "mt-4 cursor-pointer peer-focus-visible:outline-2 peer-focus-visible:outline-offset-2 peer-focus-visible:outline-sea-600 " +
            (disabled ? "pointer-events-none" : ""),
        )}
      >
        Choose files
      </label>
      {hint ? <p className="mt-3 text-sm text-slate-600">{hint}</p> : null}
    </div>
  );
}
