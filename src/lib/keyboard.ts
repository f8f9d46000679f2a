// Helpers for single-key shortcuts, so a shortcut never fires while someone is typing.
import type { KeyboardEvent as ReactKeyboardEvent } from "react";

/** True when the key event comes from a place that takes typed text (inputs, text areas, selects, editable content). */
export function isTypingTarget(target: EventTarget | null): boolean {
  if (!(target instanceof HTMLElement)) return false;
  if (target.isContentEditable) return true;
  if (target instanceof HTMLTextAreaElement || target instanceof HTMLSelectElement) return true;
  if (target instanceof HTMLInputElement) return !["radio", "checkbox", "button", "submit", "reset", "range", "color", "file"].includes(target.type);
  return false;
}

/** True when a modifier other than Shift is held (those keys belong to the browser). */
export function hasCommandModifier(e: KeyboardEvent | ReactKeyboardEvent): boolean {
  return e.ctrlKey || e.metaKey || e.altKey;
}
