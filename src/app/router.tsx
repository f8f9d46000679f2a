// Routes of the client. Every screen is its own lazily loaded chunk so the entry stays
// small; guards run as loaders against the cached session before a screen renders.
import type { ComponentType } from "react";
import { createBrowserRouter, data, redirect, type LoaderFunctionArgs } from "react-router-dom";
import type { Role } from "../../shared/roles";
import { setUnauthorizedHandler } from "../lib/api-client";
import { safeNext } from "../lib/safe-next";
import { hasAnyRole, sessionKey, sessionQuery } from "../lib/session";
import { queryClient } from "./query-client";
import { AppLayout } from "./layout/app-layout";
import { PublicLayout } from "./layout/public-layout";
import { RootError, RouteError } from "./layout/route-error";
import { FullPageLoading } from "./layout/full-page-loading";

function page(load: () => Promise<{ default: ComponentType }>) {
  return async () => ({ Component: (await load()).default });
}

async function requireSession({ request }: LoaderFunctionArgs) {
  const user = await queryClient.ensureQueryData(sessionQuery);
  if (!user) {
    const url = new URL(request.url);
    throw redirect(`/sign-in?next=${encodeURIComponent(url.pathname + url.search)}`);
  }
  return null;
}

function requireRoles(roles: readonly Role[]) {
  return async () => {
    const user = await queryClient.ensureQueryData(sessionQuery);
    if (!hasAnyRole(user, roles)) throw data("You do not have access to this screen.", { status: 403 });
    return null;
  };
}

async function redirectIfSignedIn({ request }: LoaderFunctionArgs) {
  const user = await queryClient.ensureQueryData(sessionQuery);
  if (user) throw redirect(safeNext(new URL(request.url).searchParams.get("next")));
  return null;
}

export const router = createBrowserRouter([
  {
    id: "root",
    HydrateFallback: FullPageLoading,
    errorElement: <RootError />,
    children: [
      {
        Component: PublicLayout,
        children: [
          { path: "sign-in", loader: redirectIfSignedIn, lazy: page(() => import("../features/auth/routes/sign-in")) },
          { path: "forgot-password", lazy: page(() => import("../features/auth/routes/forgot-password")) },
          { path: "reset-password", lazy: page(() => import("../features/auth/routes/reset-password")) },
          { path: "invitation", lazy: page(() => import("../features/auth/routes/accept-invitation")) },
        ],
      },
      {
        Component: AppLayout,
        loader: requireSession,
        // Re-checking the session on every navigation would cost a request per click.
        shouldRevalidate: () => false,
        children: [
          {
            errorElement: <RouteError />,
            children: [
              { index: true, lazy: page(() => import("../features/home/routes/home")) },
              {
                path: "setup/people",
                loader: requireRoles(["admin", "qa_lead"]),
                lazy: page(() => import("../features/people/routes/people")),
              },
              {
                path: "setup/audit",
                loader: requireRoles(["admin"]),
                lazy: page(() => import("../features/audit/routes/audit-log")),
              },
              {
                path: "exams",
                loader: requireRoles(["sonographer"]),
                lazy: page(() => import("../features/exams/routes/my-exams")),
              },
              {
                path: "exams/new",
                loader: requireRoles(["sonographer"]),
                lazy: page(() => import("../features/exams/routes/new-exam")),
              },
              {
                path: "exams/:id/edit",
                loader: requireRoles(["sonographer"]),
                lazy: page(() => import("../features/exams/routes/edit-exam")),
              },
              { path: "exams/:id", lazy: page(() => import("../features/exams/routes/exam-page")) },
              {
                path: "received",
                loader: requireRoles(["sonographer", "qa_lead", "admin"]),
                lazy: page(() => import("../features/dicom-inbox/routes/received")),
              },
              {
                path: "received/:id/exam",
                loader: requireRoles(["sonographer"]),
                lazy: page(() => import("../features/dicom-inbox/routes/exam-from-study")),
              },
              {
                path: "queue",
                loader: requireRoles(["reviewer"]),
                lazy: page(() => import("../features/reviewing/routes/queue")),
              },
              {
                path: "queue/:assignmentId",
                loader: requireRoles(["reviewer"]),
                lazy: page(() => import("../features/reviewing/routes/scoring-workspace")),
              },
              {
                path: "reviews/questions",
                loader: requireRoles(["reviewer", "qa_lead"]),
                lazy: page(() => import("../features/questions/routes/questions")),
              },
              {
                path: "reviews/exams/:examId",
                loader: requireRoles(["reviewer", "qa_lead"]),
                lazy: page(() => import("../features/questions/routes/question")),
              },
              {
                path: "feedback",
                loader: requireRoles(["sonographer"]),
                lazy: page(() => import("../features/feedback/routes/feedback-list")),
              },
              {
                path: "progress",
                loader: requireRoles(["sonographer"]),
                lazy: page(() => import("../features/progress/routes/progress")),
              },
              {
                path: "feedback/:examId",
                loader: requireRoles(["sonographer"]),
                lazy: page(() => import("../features/feedback/routes/feedback-detail")),
              },
              {
                path: "oversight/adjudication",
                loader: requireRoles(["qa_lead", "reviewer"]),
                lazy: page(() => import("../features/oversight/routes/adjudications")),
              },
              {
                path: "oversight/adjudication/:examId",
                loader: requireRoles(["qa_lead", "reviewer"]),
                lazy: page(() => import("../features/oversight/routes/adjudication")),
              },
              {
                path: "oversight/follow-ups",
                loader: requireRoles(["qa_lead"]),
                lazy: page(() => import("../features/oversight/routes/follow-ups")),
              },
              {
                path: "oversight/calibration",
                loader: requireRoles(["qa_lead"]),
                lazy: page(() => import("../features/calibration/routes/calibration-sets")),
              },
              {
                path: "oversight/calibration/new",
                loader: requireRoles(["qa_lead"]),
                lazy: page(() => import("../features/calibration/routes/new-calibration-set")),
              },
              {
                path: "oversight/calibration/:id",
                loader: requireRoles(["qa_lead"]),
                lazy: page(() => import("../features/calibration/routes/calibration-results")),
              },
              {
                path: "oversight/agreement",
                loader: requireRoles(["qa_lead", "admin"]),
                lazy: page(() => import("../features/agreement/routes/agreement")),
              },
              {
                path: "oversight/roster",
                loader: requireRoles(["qa_lead"]),
                lazy: page(() => import("../features/roster/routes/roster")),
              },
              {
                path: "oversight/roster/:userId",
                loader: requireRoles(["qa_lead"]),
                lazy: page(() => import("../features/roster/routes/sonographer")),
              },
              {
                path: "oversight/reports",
                loader: requireRoles(["qa_lead"]),
                lazy: page(() => import("../features/roster/routes/reports")),
              },
              {
                path: "oversight/program",
                loader: requireRoles(["qa_lead", "admin"]),
                lazy: page(() => import("../features/program-report/routes/program")),
              },
              {
                path: "setup/rubrics",
                loader: requireRoles(["qa_lead"]),
                lazy: page(() => import("../features/rubrics/routes/rubrics")),
              },
              {
                path: "setup/rubrics/new",
                loader: requireRoles(["qa_lead"]),
                lazy: page(() => import("../features/rubrics/routes/rubric-editor")),
              },
              {
                path: "setup/rubrics/:id",
                loader: requireRoles(["qa_lead"]),
                lazy: page(() => import("../features/rubrics/routes/rubric-editor")),
              },
              {
                path: "setup/snippets",
                loader: requireRoles(["qa_lead"]),
                lazy: page(() => import("../features/settings/routes/snippets")),
              },
              {
                path: "setup/settings",
                loader: requireRoles(["qa_lead", "admin"]),
                lazy: page(() => import("../features/settings/routes/program-settings")),
              },
              { path: "setup/applications", lazy: page(() => import("../features/applications/routes/applications")) },
              {
                path: "setup/applications/new",
                loader: requireRoles(["qa_lead", "admin"]),
                lazy: page(() => import("../features/applications/routes/application-editor")),
              },
              { path: "setup/applications/:id", lazy: page(() => import("../features/applications/routes/application-editor")) },
              { path: "account/password", lazy: page(() => import("../features/auth/routes/change-password")) },
              { path: "*", lazy: page(() => import("./not-found-page")) },
            ],
          },
        ],
      },
    ],
  },
]);

// A 401 on any call means the session is gone: forget cached data and ask to sign in again,
// coming back to the same page afterwards.
setUnauthorizedHandler(() => {
  const { pathname, search } = router.state.location;
  if (pathname === "/sign-in") return;
  queryClient.removeQueries();
  queryClient.setQueryData(sessionKey, null);
  void router.navigate(`/sign-in?next=${encodeURIComponent(pathname + search)}`, { replace: true });
});
