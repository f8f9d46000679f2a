// Buttons in four weights. Primary (sea) is for the one main action of a screen; danger
// (coral) only for actions that remove or deactivate something.
import type { ComponentProps } from "react";
import { LoaderCircle } from "lucide-react";

type Variant = "primary" | "secondary" | "danger" | "ghost";
type Size = "md" | "sm";

const base =
  "inline-flex items-center justify-center gap-2 rounded-md font-semibold transition-colors " +
  "disabled:cursor-not-allowed disabled:opacity-60 focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-sea-600";

const variants: Record<Variant, string> = {
  primary: "bg-sea-600 text-white hover:bg-sea-700 active:bg-sea-800",
  secondary: "border border-slate-300 bg-white text-ink-900 hover:bg-paper-200 active:bg-paper-300",
  danger: "bg-coral-600 text-white hover:bg-coral-700 active:bg-coral-800",
  ghost: "text-sea-700 hover:bg-sea-50 active:bg-sea-100",
};

const sizes: Record<Size, string> = {
  md: "px-4 py-2 text-sm",
  sm: "px-2.5 py-1 text-sm",
};

/** Class names for anything that should look like a button (links included). */
export function buttonClasses(variant: Variant = "primary", size: Size = "md", extra = ""): string {
  return `${base} ${variants[variant]} ${sizes[size]} ${extra}`.trim();
}

type ButtonProps = ComponentProps<"button"> & {
  variant?: Variant;
  size?: Size;
  /** Shows a spinner and disables the button while work is in flight. */
  busy?: boolean;
};

export function Button({ variant = "primary", size = "md", busy = false, className = "", children, disabled, type = "button", ...rest }: ButtonProps) {
  return (
    <button type={type} className={buttonClasses(variant, size, className)} disabled={disabled || busy} aria-busy={busy || undefined} {...rest}>
      {busy ? <LoaderCircle aria-hidden="true" className="size-4 animate-spin" /> : null}
      {children}
    </button>
  );
}
