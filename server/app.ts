// Builds the Express app (no listen): security headers, JSON parsing with a size limit,
// the API routes, OpenAPI, JSON errors, and the built client with history fallback.
import express from "express";
import cookieParser from "cookie-parser";
import helmet from "helmet";
import fs from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { OpenAPIRegistry, OpenApiGeneratorV31 } from "@asteasolutions/zod-to-openapi";
import { apiNotFound, errorHandler } from "./http/errors";
import { hstsWhenSecure, sameOriginGuard } from "./http/security";
import type { RouteKit } from "./http/route";
import { createAuthenticate } from "./auth/passport";
import { registerApiRoutes } from "./routes";
import { log as defaultLog } from "./log";
import type { AppDeps } from "./http/context";

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
    checkResponses: deps.config.checkResponses,
  };
  kit.registry.registerComponent("securitySchemes", "bearer", { type: "http", scheme: "bearer", bearerFormat: "JWT" });
  kit.registry.registerComponent("securitySchemes", "cookie", { type: "apiKey", in: "cookie", name: "soundings_session" });
  const ctx = { ...deps, log };
  registerApiRoutes(kit, ctx);

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
  kit.routes.push({ method: "GET", path: "/openapi.json", access: "public", responses: { 200: "json" } });

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
