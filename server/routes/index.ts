// Every API resource folder, registered in one place: app.ts calls registerApiRoutes and
// knows no route itself. One folder per URL resource, each with its router.ts.
import type { RouteKit } from "../http/route";
import type { RouteContext } from "../http/context";
import { registerHealthRoutes } from "./health/router";
import { registerAuthRoutes } from "./auth/router";
import { registerUserRoutes } from "./users/router";
import { registerApplicationRoutes } from "./applications/router";
import { registerHomeRoutes } from "./home/router";
import { registerAuditRoutes } from "./audit/router";
import { registerExamRoutes } from "./exams/router";
import { registerClipRoutes } from "./clips/router";
import { registerQueueRoutes } from "./queue/router";
import { registerRubricRoutes } from "./rubrics/router";
import { registerSettingsRoutes } from "./settings/router";
import { registerSnippetRoutes } from "./snippets/router";
import { registerFollowUpRoutes } from "./follow-ups/router";
import { registerMeRoutes } from "./me/router";
import { registerRosterRoutes } from "./roster/router";
import { registerNotificationRoutes } from "./notifications/router";
import { registerReportRoutes } from "./reports/router";
import { registerCalibrationRoutes } from "./calibration-sets/router";
import { registerAssignmentRoutes } from "./assignments/router";
import { registerAdjudicationRoutes } from "./adjudications/router";
import { registerReviewRoutes } from "./reviews/router";
import { registerDicomInboxRoutes } from "./dicom-inbox/router";

export function registerApiRoutes(kit: RouteKit, ctx: RouteContext) {
  registerHealthRoutes(kit, ctx);
  registerAuthRoutes(kit, ctx);
  registerHomeRoutes(kit, ctx);
  registerApplicationRoutes(kit, ctx);
  registerUserRoutes(kit, ctx);
  registerAuditRoutes(kit, ctx);
  registerExamRoutes(kit, ctx);
  registerClipRoutes(kit, ctx);
  registerQueueRoutes(kit, ctx);
  registerAssignmentRoutes(kit, ctx);
  registerAdjudicationRoutes(kit, ctx);
  registerFollowUpRoutes(kit, ctx);
  registerSnippetRoutes(kit, ctx);
  registerSettingsRoutes(kit, ctx);
  registerRubricRoutes(kit, ctx);
  registerMeRoutes(kit, ctx);
  registerRosterRoutes(kit, ctx);
  registerNotificationRoutes(kit, ctx);
  registerReportRoutes(kit, ctx);
  registerCalibrationRoutes(kit, ctx);
  registerReviewRoutes(kit, ctx);
  registerDicomInboxRoutes(kit, ctx);
}
