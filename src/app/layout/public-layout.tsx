// The frame for signed-out screens (sign-in, passwords, invitations): one centred panel.
import { Outlet } from "react-router-dom";
import { Wordmark } from "./brand-mark";
import { SiteFooter } from "./site-footer";
import { SkipLink } from "./skip-link";
import { RouteProgress } from "./route-progress";

export function PublicLayout() {
  return (
    <div className="flex min-h-screen flex-col bg-paper-200">
      <SkipLink />
      <RouteProgress />
      <header className="px-4 pt-8 sm:px-6">
        <div className="mx-auto w-full max-w-md">
          <Wordmark />
        </div>
      </header>
      <main id="main-content" tabIndex={-1} className="flex-1 px-4 py-8 focus:outline-none sm:px-6">
        <div className="mx-auto w-full max-w-md rounded-lg border border-slate-200 bg-paper-50 p-6 shadow-sm sm:p-8">
          <Outlet />
        </div>
      </main>
      <SiteFooter />
    </div>
  );
}
