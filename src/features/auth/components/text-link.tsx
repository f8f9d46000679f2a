// An in-text link in the sea accent, underlined so it is recognisable without colour.
import type { ComponentProps } from "react";
import { Link } from "react-router-dom";

export function TextLink({ className = "", ...props }: ComponentProps<typeof Link>) {
  return <Link className={`font-semibold text-sea-700 underline underline-offset-2 hover:text-sea-800 ${className}`} {...props} />;
}
