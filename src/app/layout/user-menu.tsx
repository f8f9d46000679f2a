// The account panel: who is signed in, in which program, with which roles; change
// password and sign out. A disclosure (button + panel), closed by Escape or a click outside.
import { useCallback, useId, useRef, useState } from "react";
import { Link, useLocation, useNavigate } from "react-router-dom";
import { useQueryClient } from "@tanstack/react-query";
import { ChevronDown, KeyRound, LogOut } from "lucide-react";
import { ROLE_LABELS } from "../../../shared/roles";
import type { SessionUser } from "../../../shared/schemas/auth";
import { sessionKey, signOut } from "../../lib/session";
import { useDismiss } from "../../lib/use-dismiss";

const menuItem = "flex w-full items-center gap-2 rounded-md px-2 py-1.5 text-left font-semibold text-sea-700 hover:bg-sea-50 disabled:opacity-60";

function initials(name: string): string {
  const parts = name.trim().split(/\s+/).filter(Boolean);
  const letters = parts.length > 1 ? parts[0][0] + parts[parts.length - 1][0] : (parts[0] ?? "?").slice(0, 2);
  return letters.toUpperCase();
}

export function UserMenu({ user }: { user: SessionUser }) {
  // The panel is open for the page it was opened on: navigating anywhere closes it.
  const [openOn, setOpenOn] = useState<string | null>(null);
  const [signingOut, setSigningOut] = useState(false);
  const panelId = useId();
  const rootRef = useRef<HTMLDivElement>(null);
  const buttonRef = useRef<HTMLButtonElement>(null);
  const location = useLocation();
  const navigate = useNavigate();
  const queryClient = useQueryClient();

  const open = openOn === location.key;
  const setOpen = (value: boolean) => setOpenOn(value ? location.key : null);

  const close = useCallback(() => setOpenOn(null), []);
  useDismiss(open, close, rootRef, buttonRef);

  async function handleSignOut() {
    setSigningOut(true);
    try {
      await signOut();
    } catch {
      // Even if the server call fails, forget the session locally: the cookie is httpOnly
      // and expires on its own, and staying "signed in" here would be misleading.
    }
    queryClient.removeQueries();
    queryClient.setQueryData(sessionKey, null);
    navigate("/sign-in", { replace: true });
  }

  return (
    <div
      ref={rootRef}
      className="relative"
      onBlur={(event) => {
        // Tabbing out of the panel closes it, as a click outside does.
        if (open && event.relatedTarget && !rootRef.current?.contains(event.relatedTarget as Node)) setOpenOn(null);
      }}
    >
      <button
        ref={buttonRef}
        type="button"
        aria-expanded={open}
        aria-controls={panelId}
        aria-label={`Account: ${user.name}`}
        onClick={() => setOpen(!open)}
        className="flex items-center gap-2 rounded-md px-2 py-1 text-sm text-ink-900 hover:bg-paper-200"
      >
        <span aria-hidden="true" className="grid size-8 place-items-center rounded-full bg-ink-950 text-xs font-semibold text-sea-200">
          {initials(user.name)}
        </span>
        <span className="hidden max-w-40 truncate font-semibold sm:inline">{user.name}</span>
        <ChevronDown aria-hidden="true" className="size-4 text-slate-600" />
      </button>
      <div id={panelId} hidden={!open} className="absolute right-0 z-40 mt-2 w-72 rounded-lg border border-slate-200 bg-paper-50 p-4 text-sm shadow-lg">
        <p className="font-semibold text-ink-950">{user.name}</p>
        <p className="truncate text-slate-600">{user.email}</p>
        <dl className="mt-3 space-y-2 border-t border-slate-200 pt-3">
          <div>
            <dt className="text-xs font-semibold uppercase tracking-wide text-slate-600">Program</dt>
            <dd className="text-ink-900">{user.programName}</dd>
          </div>
          <div>
            <dt className="text-xs font-semibold uppercase tracking-wide text-slate-600">Roles</dt>
            <dd className="text-ink-900">{user.roles.map((r) => ROLE_LABELS[r]).join(", ") || "None"}</dd>
          </div>
        </dl>
        <div className="mt-3 flex flex-col gap-1 border-t border-slate-200 pt-3">
          <Link to="/account/password" className={menuItem}>
            <KeyRound aria-hidden="true" className="size-4" />
            Change password
          </Link>
          <button type="button" className={menuItem} onClick={handleSignOut} disabled={signingOut} aria-busy={signingOut || undefined}>
            <LogOut aria-hidden="true" className="size-4" />
            {signingOut ? "Signing out…" : "Sign out"}
          </button>
        </div>
      </div>
    </div>
  );
}
