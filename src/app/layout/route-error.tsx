// What a route shows when its guard or code fails: no access (403), not found (404), or a
// failure with a way to try again. RootError covers failures outside the signed-in frame.
import { isRouteErrorResponse, Link, useRouteError } from "react-router-dom";
import { buttonClasses, Button } from "../../components/ui/button";
import { PageHeader } from "../../components/ui/page-header";
import { SiteFooter } from "./site-footer";
import { Wordmark } from "./brand-mark";

function describe(error: unknown): { title: string; body: string; retry: boolean } {
  if (isRouteErrorResponse(error)) {
    if (error.status === 403) return { title: "No access", body: "Your roles in this program do not include this screen.", retry: false };
    if (error.status === 404) return { title: "Page not found", body: "There is no page at this address.", retry: false };
  }
  const message = error instanceof Error ? error.message : "";
  // A chunk that fails to load usually means a new version was deployed: a reload fetches it.
  return {
    title: "Something went wrong",
    body: message ? `This screen could not be shown: ${message}` : "This screen could not be shown.",
    retry: true,
  };
}

export function RouteError() {
  const { title, body, retry } = describe(useRouteError());
  return (
    <div>
      <PageHeader title={title} />
      <p className="text-slate-700">{body}</p>
      <div className="mt-4 flex gap-2">
        {retry ? <Button onClick={() => window.location.reload()}>Reload the page</Button> : null}
        <Link to="/" className={buttonClasses(retry ? "secondary" : "primary")}>
          Go to Home
        </Link>
      </div>
    </div>
  );
}

export function RootError() {
  const { title, body } = describe(useRouteError());
  return (
    <div className="flex min-h-screen flex-col bg-paper">
      <header className="px-6 pt-8">
        <Wordmark />
      </header>
      <main id="main-content" className="flex-1 px-6 py-8">
        <div className="max-w-xl">
          <PageHeader title={title} />
          <p className="text-slate-700">{body}</p>
          <Button className="mt-4" onClick={() => window.location.reload()}>
            Try again
          </Button>
        </div>
      </main>
      <SiteFooter />
    </div>
  );
}
