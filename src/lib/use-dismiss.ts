// Closes an open popover when the pointer goes down outside it, or on Escape (which also
// returns focus to the button that opened it).
import { useEffect, type RefObject } from "react";

/** While `open`, calls `close` on an outside pointer press or Escape. */
export function useDismiss(open: boolean, close: () => void, rootRef: RefObject<HTMLElement | null>, buttonRef: RefObject<HTMLElement | null>) {
  useEffect(() => {
    if (!open) return;
    function onPointer(event: PointerEvent) {
      if (!rootRef.current?.contains(event.target as Node)) close();
    }
    function onKey(event: KeyboardEvent) {
      if (event.key === "Escape") {
        close();
        buttonRef.current?.focus();
      }
    }
    document.addEventListener("pointerdown", onPointer);
    document.addEventListener("keydown", onKey);
    return () => {
      document.removeEventListener("pointerdown", onPointer);
      document.removeEventListener("keydown", onKey);
    };
  }, [open, close, rootRef, buttonRef]);
}
