// A key as it is printed on the keyboard, for shortcut hints. Tone "dark" sits on the ink viewing surface.
import type { ReactNode } from "react";

export function Kbd({ children, tone = "light" }: { children: ReactNode; tone?: "light" | "dark" }) {
  const look = tone === "dark" ? "border-ink-500 bg-ink-800 text-ink-50" : "border-slate-300 bg-paper-50 text-ink-900";
  return (
    <kbd className={`inline-flex min-w-[1.4em] items-center justify-center rounded border px-1 font-sans text-[0.7rem] leading-4 font-semibold ${look}`}>
      {children}
    </kbd>
  );
}
