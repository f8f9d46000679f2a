// Declares an API route once: Express wiring (authenticate → validate → authorize →
// handler) and its OpenAPI entry come from the same object, so the published document and
// the role-by-route test can never miss a route.
import type { Request, Response, NextFunction, RequestHandler, Router } from "express";
import type { OpenAPIRegistry } from "@asteasolutions/zod-to-openapi";
import { z, type ZodType } from "zod";
import type { Role } from "../../shared/roles";
import { errorSchema } from "../../shared/schemas/common";
import { HttpError, validationError } from "./errors";
import { assertStorable } from "./strings";
import type { AuthUser } from "../auth/types";

/** Who may call a route: anyone, any signed-in member, or members holding one of the roles. */
export type Access = "public" | "signed_in" | readonly Role[];

export interface RouteSpec<B extends ZodType | undefined, Q extends ZodType | undefined, P extends ZodType | undefined> {
  method: "get" | "post" | "put" | "patch" | "delete";
  /** Express path under /api, e.g. "/users/:id/roles". */
  path: string;
  summary: string;
  tag: string;
  access: Access;
  body?: B;
  query?: Q;
  params?: P;
  /** Response schemas by status, for the OpenAPI document. */
  responses: Record<number, { description: string; schema?: ZodType }>;
  /** Extra middleware run after authentication and before validation (rate limits). */
  before?: RequestHandler[];
  handler: (ctx: {
    req: Request;
    res: Response;
    /** The caller; only meaningful on routes that are not public. */
    user: AuthUser;
    body: B extends ZodType ? z.output<B> : undefined;
    query: Q extends ZodType ? z.output<Q> : undefined;
    params: P extends ZodType ? z.output<P> : undefined;
  }) => Promise<unknown> | unknown;
}

export interface RouteInfo {
  method: string;
  path: string;
  access: Access;
}

export interface RouteKit {
  router: Router;
  registry: OpenAPIRegistry;
  authenticate: RequestHandler;
  routes: RouteInfo[];
}

const toOpenApiPath = (p: string) => p.replace(/:([A-Za-z_]+)/g, "{$1}");

/** Registers a route on the kit's router and in its OpenAPI registry. */
export function defineRoute<B extends ZodType | undefined = undefined, Q extends ZodType | undefined = undefined, P extends ZodType | undefined = undefined>(
  kit: RouteKit,
  spec: RouteSpec<B, Q, P>,
): void {
  kit.routes.push({ method: spec.method.toUpperCase(), path: spec.path, access: spec.access });
  const chain: RequestHandler[] = [];
  if (spec.access !== "public") chain.push(kit.authenticate);
  if (Array.isArray(spec.access)) {
    const allowed = spec.access as readonly Role[];
    chain.push((req, _res, next) => {
      const user = req.user as AuthUser;
      if (!user.roles.some((r) => allowed.includes(r))) {
        return next(new HttpError(403, "forbidden", `This needs one of the roles: ${allowed.join(", ")}`));
      }
      next();
    });
  }
  if (spec.before) chain.push(...spec.before);
  chain.push(async (req: Request, res: Response, next: NextFunction) => {
    try {
      const parse = (schema: ZodType | undefined, value: unknown, where: "body" | "query" | "params") => {
        if (!schema) return undefined;
        const r = schema.safeParse(value ?? {});
        if (!r.success) throw validationError(r.error, where);
        assertStorable(r.data, where);
        return r.data;
      };
      const params = parse(spec.params, req.params, "params");
      const query = parse(spec.query, req.query, "query");
      // No body at all (no Content-Type, nothing sent) has no media type to refuse: it is
      // validated as {}, so a route with an optional body accepts a bare POST and one that
      // needs fields names the first missing one. A body of another type is still refused.
      const bodyless = !req.get("content-type") && (!req.get("content-length") || req.get("content-length") === "0") && !req.get("transfer-encoding");
      if (spec.body && req.body === undefined && !bodyless && !req.is("application/json")) {
        throw new HttpError(415, "unsupported_media_type", "Send the body as application/json");
      }
      const body = parse(spec.body, req.body, "body");
      const result = await spec.handler({ req, res, user: req.user as never, body: body as never, query: query as never, params: params as never });
      if (!res.headersSent) {
        if (result === undefined) res.status(204).end();
        else res.json(result);
      }
    } catch (err) {
      next(err);
    }
  });
  kit.router[spec.method](spec.path, ...chain);

  const responses: Record<string, unknown> = {};
  for (const [status, r] of Object.entries(spec.responses)) {
    responses[status] = r.schema ? { description: r.description, content: { "application/json": { schema: r.schema } } } : { description: r.description };
  }
  if (spec.access !== "public") responses["401"] = { description: "Not signed in", content: { "application/json": { schema: errorSchema } } };
  if (Array.isArray(spec.access))
    responses["403"] = { description: `Needs one of: ${spec.access.join(", ")}`, content: { "application/json": { schema: errorSchema } } };
  if (spec.body || spec.query || spec.params)
    responses["400"] = { description: "Validation failed; the message names the field", content: { "application/json": { schema: errorSchema } } };
  kit.registry.registerPath({
    method: spec.method,
    path: `/api${toOpenApiPath(spec.path)}`,
    summary: spec.summary,
    tags: [spec.tag],
    description: spec.access === "public" ? "Open to anyone." : spec.access === "signed_in" ? "Any signed-in member." : `Roles: ${spec.access.join(", ")}.`,
    security: spec.access === "public" ? [] : [{ bearer: [] }, { cookie: [] }],
    request: {
      ...(spec.params ? { params: spec.params as never } : {}),
      ...(spec.query ? { query: spec.query as never } : {}),
      ...(spec.body ? { body: { content: { "application/json": { schema: spec.body } } } } : {}),
    },
    responses: responses as never,
  });
}
