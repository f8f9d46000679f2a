// The frame for signed-in screens: header with program and account, area navigation,
// main content and the caution footer. Moves focus to the new page's heading after
// client-side navigation so screen-reader users know the page changed.
import { useEffect, useRef } from "react";
import { Link, Outlet, useLocation } from "react-router-dom";
import { useQuery } from "@tanstack/react-query";
import { sessionQuery } from "../../lib/session";
import { Wordmark } from "./brand-mark";
import { SiteFooter } from "./site-footer";
import { SideNav } from "./side-nav";
import { SkipLink } from "./skip-link";
import { UserMenu } from "./user-menu";
import { RouteProgress } from "./route-progress";
import { NotificationsBell } from "../../features/notifications/components/notifications-bell";

export function AppLayout() {
  const { data: user } = useQuery(sessionQuery);
  const location = useLocation();
  // The path focus was last placed for: a first load (and React's development-mode second
  // run of effects) leaves focus where the browser put it; only a real page change moves it.
  const lastPath = useRef(location.pathname);
  const mainRef = useRef<HTMLElement>(null);

  useEffect(() => {
    if (lastPath.current === location.pathname) return;
    lastPath.current = location.pathname;
    const heading = mainRef.current?.querySelector<HTMLElement>("h1");
    (heading ?? mainRef.current)?.focus();
  }, [location.pathname]);

  // Signed out mid-session: the 401 handler is already on its way to the sign-in page.
  if (!user) return null;

  return (
    <div className="flex min-h-screen flex-col bg-paper">
      <SkipLink />
      <RouteProgress />
      <header className="flex items-center justify-between gap-4 border-b border-slate-200 bg-paper-50 px-4 py-2 sm:px-6">
        <div className="flex min-w-0 items-center gap-4">
          <Link to="/" aria-label="Soundings home" className="rounded-md">
            <Wordmark />
          </Link>
          <span className="hidden truncate border-l border-slate-300 pl-4 text-sm text-slate-600 sm:inline">{user.programName}</span>
        </div>
        <div className="flex items-center gap-1">
          <NotificationsBell />
          <UserMenu user={user} />
        </div>
      </header>
      <div className="flex flex-1 flex-col md:flex-row">
        <SideNav roles={user.roles} />
        <main ref={mainRef} id="main-content" tabIndex={-1} className="min-w-0 flex-1 px-4 py-6 focus:outline-none sm:px-8 sm:py-8">
          <div className="mx-auto max-w-6xl">
            <Outlet />
          </div>
        </main>
      </div>
      <SiteFooter />
    </div>
  );
}
