// Builds the Express app (no listen): security headers, JSON parsing with a size limit,
// the API routes, OpenAPI, JSON errors, and the built client with history fallback.
import express from "express";
import cookieParser from "cookie-parser";
import helmet from "helmet";
import fs from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { OpenAPIRegistry, OpenApiGeneratorV31 } from "@asteasolutions/zod-to-openapi";
import type { Db } from "./db/knex";
import type { Config } from "./config";
import { apiNotFound, errorHandler } from "./http/errors";
import { hstsWhenSecure, sameOriginGuard } from "./http/security";
import type { RouteKit } from "./http/route";
import { createAuthenticate } from "./auth/passport";
import { registerHealthRoutes } from "./routes/health/router";
import { registerAuthRoutes } from "./routes/auth/router";
import { registerUserRoutes } from "./routes/users/router";
import { registerApplicationRoutes } from "./routes/applications/router";
import { registerHomeRoutes } from "./routes/home/router";
import { registerAuditRoutes } from "./routes/audit/router";
import { registerExamRoutes } from "./routes/exams/router";
import { registerClipRoutes } from "./routes/clips/router";
import { registerQueueRoutes } from "./routes/queue/router";
import { registerOversightRoutes } from "./routes/oversight/router";
import { registerRubricRoutes } from "./routes/rubrics/router";
import { registerFeedbackRoutes } from "./routes/feedback/router";
import { registerReportRoutes } from "./routes/reports/router";
import { registerProgressRoutes } from "./routes/progress/router";
import { registerCalibrationRoutes } from "./routes/calibration/router";
import { registerQuestionRoutes } from "./routes/questions/router";
import type { Storage } from "./storage/types";
import { log as defaultLog } from "./log";
import type { JobQueue } from "./jobs/queue";

export interface AppDeps {
  db: Db;
  config: Config;
  storage: Storage;
  /** Where clip jobs are sent; the API never processes media itself. */
  jobs: Pick<JobQueue, "enqueueClip">;
  log?: (msg: unknown) => void;
  /** Folder of the built client (default: CLIENT_DIST, else dist/). */
  clientDir?: string;
}

const here = path.dirname(fileURLToPath(import.meta.url));
// CLIENT_DIST lets parallel test runs in one checkout build and serve their own copy.
const CLIENT_DIR = path.resolve(here, "..", process.env.CLIENT_DIST ?? "dist");

/** Builds the app and returns it with the table of its API routes. */
export function buildApp(deps: AppDeps) {
  const log = deps.log ?? defaultLog;
  const app = express();
  app.disable("x-powered-by");
  app.set("trust proxy", deps.config.trustProxy);
  app.use(
    helmet({
      contentSecurityPolicy: {
        // Styles and fonts come from the built client's own files only; React's style
        // props go through the CSSOM, which style-src does not govern.
        directives: {
          "img-src": ["'self'", "data:", "blob:"],
          "media-src": ["'self'", "blob:"],
          "style-src": ["'self'"],
          "font-src": ["'self'", "data:"],
        },
      },
      // Sent by hstsWhenSecure, only over HTTPS: a plain-HTTP answer may not set it (RFC 6797 section 7.2).
      strictTransportSecurity: false,
    }),
  );
  app.use(hstsWhenSecure);
  app.use("/api", sameOriginGuard(deps.config.appUrl));
  app.use("/api", express.json({ limit: deps.config.jsonBodyLimit }));
  app.use("/api", cookieParser());

  const kit: RouteKit = {
    router: express.Router(),
    registry: new OpenAPIRegistry(),
    authenticate: createAuthenticate(deps.db, deps.config.jwtSecret),
    routes: [],
  };
  kit.registry.registerComponent("securitySchemes", "bearer", { type: "http", scheme: "bearer", bearerFormat: "JWT" });
  kit.registry.registerComponent("securitySchemes", "cookie", { type: "apiKey", in: "cookie", name: "soundings_session" });
  const ctx = { ...deps, log };
  registerHealthRoutes(kit, ctx);
  registerAuthRoutes(kit, ctx);
  registerHomeRoutes(kit, ctx);
  registerApplicationRoutes(kit, ctx);
  registerUserRoutes(kit, ctx);
  registerAuditRoutes(kit, ctx);
  registerExamRoutes(kit, ctx);
  registerClipRoutes(kit, ctx);
  registerQueueRoutes(kit, ctx);
  registerOversightRoutes(kit, ctx);
  registerRubricRoutes(kit, ctx);
  registerFeedbackRoutes(kit, ctx);
  registerReportRoutes(kit, ctx);
  registerProgressRoutes(kit, ctx);
  registerCalibrationRoutes(kit, ctx);
  registerQuestionRoutes(kit, ctx);

  let openapi: unknown;
  kit.router.get("/openapi.json", (_req, res) => {
    openapi ??= new OpenApiGeneratorV31(kit.registry.definitions).generateDocument({
      openapi: "3.1.0",
      info: {
        title: "Soundings API",
        version: "1",
        description: "Image-review quality assurance for point-of-care ultrasound programs. Every route is scoped to the caller's program.",
      },
      servers: [{ url: "/" }],
    });
    res.json(openapi);
  });
  kit.routes.push({ method: "GET", path: "/openapi.json", access: "public" });

  app.use("/api", kit.router);
  app.use("/api", apiNotFound);

  serveClient(app, deps.clientDir ?? CLIENT_DIR);
  app.use(errorHandler(log));
  return { app, routes: kit.routes };
}

/**
 * The built client with history fallback. The folder is looked for on each request until
 * index.html is there (a first start may build it after the app is made); until then every
 * page answers 503 with a plain explanation instead of "Cannot GET /".
 */
function serveClient(app: express.Express, dir: string) {
  const index = path.join(dir, "index.html");
  const assets = express.static(dir, { index: false, maxAge: "1h" });
  let built = false;
  app.use((req, res, next) => {
    built ||= fs.existsSync(index);
    if (built) return assets(req, res, next);
    if (req.method !== "GET" && req.method !== "HEAD") return next();
    res
      .status(503)
      .set("Retry-After", "5")
      .type("text/plain")
      .send(
        `Soundings: the web client is not built yet (no ${index}).\nnpm start builds it before serving; otherwise run \`npm run build\` and reload this page.\n`,
      );
  });
  app.get("/{*splat}", (_req, res) => res.sendFile(index));
}

export type RouteContext = AppDeps & { log: (msg: unknown) => void };
