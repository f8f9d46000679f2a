// Shortcuts that work anywhere in the scoring workspace: Ctrl+Enter submits (even from the
// feedback box); Space, ← →, [ ], - = and L drive the player; ? opens the keyboard help.
// The rubric's own keys (digits, Enter, P/N/I) live in its fields. Nothing fires while a
// dialog is open or while typing in a text field.
import { useEffect, useRef, type RefObject } from "react";
import { hasCommandModifier, isTypingTarget } from "../../../lib/keyboard";
import type { PlayerHandle } from "../components/clip-viewer";

type Actions = {
  player: RefObject<PlayerHandle | null>;
  submit: () => void;
  openHelp: () => void;
  moveClip: (direction: 1 | -1) => void;
};

export function useWorkspaceShortcuts(actions: Actions) {
  const latest = useRef(actions);
  useEffect(() => {
    latest.current = actions;
  });

  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      const { player, submit, openHelp, moveClip } = latest.current;
      if (document.querySelector("dialog[open]")) return;
      if ((e.ctrlKey || e.metaKey) && e.key === "Enter") {
        e.preventDefault();
        submit();
        return;
      }
      if (e.defaultPrevented || hasCommandModifier(e) || isTypingTarget(e.target)) return;
      const target = e.target instanceof HTMLElement ? e.target : null;
      switch (e.key) {
        case "?":
          e.preventDefault();
          openHelp();
          break;
        case " ":
          // Buttons, links and checkboxes keep Space for themselves.
          if (target?.closest("button, a, select, summary, input[type=checkbox]")) return;
          e.preventDefault();
          player.current?.togglePlay();
          break;
        case "ArrowLeft":
        case "ArrowRight":
          // Taken from the level radios too (↑ ↓ still move between levels), so frames step wherever focus is.
          if (target?.closest("select")) return;
          e.preventDefault();
          player.current?.step(e.key === "ArrowLeft" ? -1 : 1);
          break;
        case "[":
        case "]":
          e.preventDefault();
          moveClip(e.key === "[" ? -1 : 1);
          break;
        case "-":
        case "=":
        case "+":
          e.preventDefault();
          player.current?.changeSpeed(e.key === "-" ? -1 : 1);
          break;
        case "l":
        case "L":
          e.preventDefault();
          player.current?.toggleLoop();
          break;
      }
    };
    document.addEventListener("keydown", onKey);
    return () => document.removeEventListener("keydown", onKey);
  }, []);
}
