// Declares an API route once: Express wiring (authenticate → validate → authorize →
// handler) and its OpenAPI entry come from the same object, so the published document and
// the role-by-route test can never miss a route. Each route declares the schema of its
// answers; with `checkResponses` (on in tests) every JSON answer is checked against it, and a
// field the schema does not name is a mismatch too, so the declared contract cannot drift.
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
  /**
   * Answers by status: a JSON `schema` (the wire shape, without transforms or defaults), or
   * `file` naming the media types of a non-JSON body (a download, a media stream).
   */
  responses: Record<number, ResponseSpec>;
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

export interface ResponseSpec {
  description: string;
  schema?: ZodType;
  file?: string;
}

export interface RouteInfo {
  method: string;
  path: string;
  access: Access;
  /** Declared answers: status → "json" (a schema), "file" or "none" (no body). */
  responses: Record<number, "json" | "file" | "none">;
}

export interface RouteKit {
  router: Router;
  registry: OpenAPIRegistry;
  authenticate: RequestHandler;
  routes: RouteInfo[];
  /** Check each JSON answer against its declared schema (tests); a mismatch answers 500. */
  checkResponses?: boolean;
}

const toOpenApiPath = (p: string) => p.replace(/:([A-Za-z_]+)/g, "{$1}");

/** Registers a route on the kit's router and in its OpenAPI registry. */
export function defineRoute<B extends ZodType | undefined = undefined, Q extends ZodType | undefined = undefined, P extends ZodType | undefined = undefined>(
  kit: RouteKit,
  spec: RouteSpec<B, Q, P>,
): void {
  const declared: RouteInfo["responses"] = {};
  for (const [status, r] of Object.entries(spec.responses)) declared[Number(status)] = r.schema ? "json" : r.file ? "file" : "none";
  kit.routes.push({ method: spec.method.toUpperCase(), path: spec.path, access: spec.access, responses: declared });
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
        else {
          if (kit.checkResponses) checkResponse(spec, res.statusCode, result);
          res.json(result);
        }
      }
    } catch (err) {
      next(err);
    }
  });
  kit.router[spec.method](spec.path, ...chain);

  const responses: Record<string, unknown> = {};
  for (const [status, r] of Object.entries(spec.responses)) {
    responses[status] = r.schema
      ? { description: r.description, content: { "application/json": { schema: r.schema } } }
      : r.file
        ? { description: r.description, content: Object.fromEntries(r.file.split(/,\s*/).map((t) => [t, { schema: { type: "string", format: "binary" } }])) }
        : { description: r.description };
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

/**
 * The answer as it goes on the wire (JSON round trip: dates become strings) against the
 * schema declared for its status. A missing schema, a failed parse, or a field the schema
 * does not name (zod strips those silently) throws a 500 naming the route and the path.
 */
export function checkResponse(spec: Pick<RouteSpec<undefined, undefined, undefined>, "method" | "path" | "responses">, status: number, result: unknown) {
  const where = `${spec.method.toUpperCase()} ${spec.path} → ${status}`;
  const declared = spec.responses[status];
  if (!declared) throw new HttpError(500, "response_schema_mismatch", `${where}: the route declares no answer with this status`);
  const schema = declared.schema;
  if (!schema) throw new HttpError(500, "response_schema_mismatch", `${where}: a JSON answer, but the route declares no schema for it`);
  const wire: unknown = JSON.parse(JSON.stringify(result));
  const r = schema.safeParse(wire);
  if (!r.success) {
    const issue = r.error.issues[0];
    throw new HttpError(500, "response_schema_mismatch", `${where}: ${issue.path.join(".") || "(answer)"}: ${issue.message}`);
  }
  const extra = undeclaredPath(wire, r.data, []);
  if (extra) throw new HttpError(500, "response_schema_mismatch", `${where}: ${extra} is not declared in the response schema`);
}

/** The first path present in what was sent but dropped by the parse (an undeclared field). */
function undeclaredPath(sent: unknown, parsed: unknown, at: (string | number)[]): string | undefined {
  if (Array.isArray(sent)) {
    if (!Array.isArray(parsed)) return undefined;
    for (let i = 0; i < sent.length; i++) {
      const p = undeclaredPath(sent[i], parsed[i], [...at, i]);
      if (p) return p;
    }
    return undefined;
  }
  if (sent && typeof sent === "object") {
    if (!parsed || typeof parsed !== "object") return undefined;
    for (const [k, v] of Object.entries(sent)) {
      if (!(k in parsed)) return [...at, k].join(".");
      const p = undeclaredPath(v, (parsed as Record<string, unknown>)[k], [...at, k]);
      if (p) return p;
    }
  }
  return undefined;
}
