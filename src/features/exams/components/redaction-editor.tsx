// Redaction boxes over a clip's poster, in coordinates from 0 to 1 relative to the image.
// Draw with the pointer; or add a box with the button and move it with the arrow keys
// (Shift+arrows resize) or type its position — so the keyboard can do everything.
// Saving reprocesses the clip with the boxes filled black.
import { useId, useRef, useState, type KeyboardEvent, type PointerEvent } from "react";
import type { Clip, RedactionBox } from "../../../../shared/schemas/exams";
import { Button } from "../../../components/ui/button";
import { FormMessage } from "../../../components/ui/form-message";

const MIN = 0.005;
const MAX_BOXES = 20;
const round = (n: number) => Math.round(n * 10000) / 10000;
const clamp = (n: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, n));

/** Keeps a box inside the image and at least a sliver big. */
function fit(b: RedactionBox): RedactionBox {
  const w = clamp(b.w, MIN, 1);
  const h = clamp(b.h, MIN, 1);
  return { x: round(clamp(b.x, 0, 1 - w)), y: round(clamp(b.y, 0, 1 - h)), w: round(w), h: round(h) };
}

const pct = (n: number) => `${(n * 100).toFixed(1)}%`;

type Props = {
  clip: Clip;
  label: string;
  saving: boolean;
  error: string | null;
  onSave: (boxes: RedactionBox[]) => void;
  onCancel: () => void;
};

export function RedactionEditor({ clip, label, saving, error, onSave, onCancel }: Props) {
  const helpId = useId();
  const surface = useRef<HTMLDivElement>(null);
  const boxRefs = useRef<(HTMLButtonElement | null)[]>([]);
  const [boxes, setBoxes] = useState<RedactionBox[]>(clip.redactions);
  const [selected, setSelected] = useState<number | null>(null);
  const [draft, setDraft] = useState<{ x0: number; y0: number; x1: number; y1: number } | null>(null);
  const changed = JSON.stringify(boxes) !== JSON.stringify(clip.redactions);
  const full = boxes.length >= MAX_BOXES;
  const aspect = clip.width && clip.height ? clip.width / clip.height : 4 / 3;

  const point = (e: PointerEvent) => {
    const r = surface.current!.getBoundingClientRect();
    return { x: clamp((e.clientX - r.left) / r.width, 0, 1), y: clamp((e.clientY - r.top) / r.height, 0, 1) };
  };

  const onPointerDown = (e: PointerEvent<HTMLDivElement>) => {
    if (e.target !== e.currentTarget || e.button !== 0 || full) return;
    e.currentTarget.setPointerCapture(e.pointerId);
    const p = point(e);
    setDraft({ x0: p.x, y0: p.y, x1: p.x, y1: p.y });
  };
  const onPointerMove = (e: PointerEvent<HTMLDivElement>) => {
    if (!draft) return;
    const p = point(e);
    setDraft({ ...draft, x1: p.x, y1: p.y });
  };
  const onPointerUp = () => {
    if (!draft) return;
    const box = { x: Math.min(draft.x0, draft.x1), y: Math.min(draft.y0, draft.y1), w: Math.abs(draft.x1 - draft.x0), h: Math.abs(draft.y1 - draft.y0) };
    setDraft(null);
    if (box.w < 0.01 || box.h < 0.01) return;
    setBoxes([...boxes, fit(box)]);
    setSelected(boxes.length);
  };

  const change = (i: number, next: Partial<RedactionBox>) => setBoxes(boxes.map((b, j) => (j === i ? fit({ ...b, ...next }) : b)));
  const remove = (i: number) => {
    setBoxes(boxes.filter((_, j) => j !== i));
    setSelected(null);
  };
  const add = () => {
    setBoxes([...boxes, fit({ x: 0.4, y: 0.45, w: 0.2, h: 0.1 })]);
    setSelected(boxes.length);
    // Focus the new box so the arrow keys act on it at once.
    requestAnimationFrame(() => boxRefs.current[boxes.length]?.focus());
  };

  const onBoxKey = (i: number, e: KeyboardEvent) => {
    const step = e.altKey ? 0.002 : 0.01;
    const b = boxes[i];
    const moves: Record<string, [number, number]> = { ArrowLeft: [-step, 0], ArrowRight: [step, 0], ArrowUp: [0, -step], ArrowDown: [0, step] };
    if (e.key in moves) {
      e.preventDefault();
      const [dx, dy] = moves[e.key];
      change(i, e.shiftKey ? { w: b.w + dx, h: b.h + dy } : { x: b.x + dx, y: b.y + dy });
    } else if (e.key === "Delete" || e.key === "Backspace") {
      e.preventDefault();
      remove(i);
    }
  };

  const shown = draft
    ? { x: Math.min(draft.x0, draft.x1), y: Math.min(draft.y0, draft.y1), w: Math.abs(draft.x1 - draft.x0), h: Math.abs(draft.y1 - draft.y0) }
    : null;

  return (
    <div className="space-y-3">
      <p id={helpId} className="text-sm text-slate-700">
        Drag on the poster to cover burned-in text with a black box. Or add a box, then move it with the arrow keys, resize it with Shift and the arrow keys,
        and remove it with Delete. Saving makes a new copy of the clip with the boxes filled black.
      </p>
      <div className="rounded-md bg-ink-950 p-2">
        {/* As wide as the panel allows but never taller than 60% of the screen; the overlay
            matches the image exactly, so box coordinates are relative to the image. */}
        <div className="relative mx-auto w-full select-none" style={{ maxWidth: `calc(60vh * ${aspect})` }}>
          <img src={clip.media.poster ?? undefined} alt={`Poster of ${label}, for redaction`} draggable={false} className="block h-auto w-full" />
          <div
            ref={surface}
            aria-describedby={helpId}
            className={`absolute inset-0 touch-none ${full ? "cursor-not-allowed" : "cursor-crosshair"}`}
            onPointerDown={onPointerDown}
            onPointerMove={onPointerMove}
            onPointerUp={onPointerUp}
            onPointerCancel={() => setDraft(null)}
          >
            {boxes.map((b, i) => (
              <button
                key={i}
                ref={(el) => {
                  boxRefs.current[i] = el;
                }}
                type="button"
                aria-label={`Box ${i + 1}: left ${pct(b.x)}, top ${pct(b.y)}, width ${pct(b.w)}, height ${pct(b.h)}`}
                aria-describedby={helpId}
                aria-pressed={selected === i}
                onClick={() => setSelected(i)}
                onFocus={() => setSelected(i)}
                onKeyDown={(e) => onBoxKey(i, e)}
                className={`absolute bg-black ${selected === i ? "outline-2 outline-offset-1 outline-sea-300" : "outline-1 outline-ink-400"} outline`}
                style={{ left: pct(b.x), top: pct(b.y), width: pct(b.w), height: pct(b.h) }}
              >
                <span className="text-xs font-semibold text-ink-200">{i + 1}</span>
              </button>
            ))}
            {shown ? (
              <div
                aria-hidden="true"
                className="pointer-events-none absolute border-2 border-dashed border-sea-300 bg-black/70"
                style={{ left: pct(shown.x), top: pct(shown.y), width: pct(shown.w), height: pct(shown.h) }}
              />
            ) : null}
          </div>
        </div>
      </div>

      <div className="flex flex-wrap items-center gap-2">
        <Button variant="secondary" size="sm" onClick={add} disabled={full}>
          Add a box
        </Button>
        <span className="text-sm text-slate-600" aria-live="polite">
          {boxes.length === 0 ? "No boxes." : `${boxes.length} ${boxes.length === 1 ? "box" : "boxes"}.`}
          {full ? ` At most ${MAX_BOXES}.` : ""}
        </span>
      </div>

      {boxes.length > 0 ? (
        <ol className="space-y-2">
          {boxes.map((b, i) => (
            <li key={i}>
              <fieldset
                className={`flex flex-wrap items-end gap-2 rounded-md border px-3 py-2 ${selected === i ? "border-sea-400 bg-sea-50" : "border-slate-200 bg-white"}`}
              >
                <legend className="sr-only">Box {i + 1}</legend>
                <span aria-hidden="true" className="mb-1 w-14 text-sm font-semibold text-ink-900">
                  Box {i + 1}
                </span>
                {(
                  [
                    ["x", "Left"],
                    ["y", "Top"],
                    ["w", "Width"],
                    ["h", "Height"],
                  ] as const
                ).map(([key, name]) => (
                  <label key={key} className="text-xs font-semibold text-slate-700">
                    {name} %<span className="sr-only"> of box {i + 1}</span>
                    <input
                      type="number"
                      min={0}
                      max={100}
                      step={0.5}
                      value={Number((b[key] * 100).toFixed(1))}
                      onFocus={() => setSelected(i)}
                      onChange={(e) => {
                        const v = Number(e.target.value);
                        if (Number.isFinite(v)) change(i, { [key]: v / 100 });
                      }}
                      className="mt-0.5 block w-20 rounded border border-slate-400 bg-white px-2 py-1 text-sm tabular-nums text-ink-950"
                    />
                  </label>
                ))}
                <Button variant="ghost" size="sm" onClick={() => remove(i)} aria-label={`Remove box ${i + 1}`}>
                  Remove
                </Button>
              </fieldset>
            </li>
          ))}
        </ol>
      ) : null}

      <FormMessage message={error} />
      <div className="flex flex-wrap gap-2">
        <Button onClick={() => onSave(boxes)} disabled={!changed} busy={saving}>
          Save boxes and reprocess
        </Button>
        <Button variant="secondary" onClick={onCancel} disabled={saving}>
          Cancel
        </Button>
      </div>
    </div>
  );
}
