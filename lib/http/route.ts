import "server-only";
import { NextResponse } from "next/server";
import type { z } from "zod";
import { authorizeAction, parseInput } from "@/lib/auth/guard";
import type { Action, Scope } from "@/lib/auth/permissions";
import { getRequestUser, type SessionUser } from "@/lib/auth/session";
import type { ApiKey } from "@/db/schema";
import { authenticateApiKey } from "@/lib/api-keys/service";
import { DomainError, ForbiddenError, RateLimitedError, UnauthenticatedError } from "@/lib/errors";
import { isProduction } from "@/lib/config";
import { log } from "@/lib/log";
import { JSON_BODY_LIMITS } from "@/lib/limits";
import { API_CONTENT_SECURITY_POLICY, commonSecurityHeaders } from "./security-headers";
import { workerWritesDone } from "@/lib/workers/write-gate";
import { assertSameOrigin, readJsonBody } from "./request-guard";

export type ErrorBody = { error: { code: string; message: string; fields?: Record<string, string[]> } };

export function errorResponse(error: unknown): NextResponse<ErrorBody> {
  if (error instanceof DomainError) {
    const headers: Record<string, string> = {};
    if (error instanceof RateLimitedError) headers["Retry-After"] = String(error.retryAfterSeconds);
    return NextResponse.json(
      { error: { code: error.code, message: error.message, ...(error.fields ? { fields: error.fields } : {}) } },
      { status: error.status, headers },
    );
  }
  log.error({ err: error }, "unhandled error in route handler");
  return NextResponse.json(
    { error: { code: "internal_error", message: "Something went wrong on our side. The error was logged." } },
    { status: 500 },
  );
}

type RouteContext = { params: Promise<Record<string, string | string[]>> };

type HandlerArgs<T> = {
  request: Request;
  params: Record<string, string>;
  user: SessionUser;
  scope: Scope;
  input: T;
};

type PublicHandlerArgs = { request: Request; params: Record<string, string> };

/**
 * The input of a request: the query string for GET, HEAD and DELETE, otherwise the JSON body
 * (at most `maxBodyBytes`, declared as JSON, valid UTF-8; see `readJsonBody`).
 */
async function readInput(request: Request, maxBodyBytes: number = JSON_BODY_LIMITS.defaultBytes): Promise<unknown> {
  if (request.method === "GET" || request.method === "HEAD" || request.method === "DELETE") {
    return Object.fromEntries(new URL(request.url).searchParams);
  }
  return readJsonBody(request, maxBodyBytes);
}

function flatParams(raw: Record<string, string | string[]>): Record<string, string> {
  return Object.fromEntries(Object.entries(raw).map(([k, v]) => [k, Array.isArray(v) ? v.join("/") : v]));
}

function logOutcome(request: Request, status: number, startedAt: number, userId?: number) {
  const url = new URL(request.url);
  log.info(
    { method: request.method, path: url.pathname, status, ms: Math.round(performance.now() - startedAt), userId },
    "request",
  );
}

/**
 * A request that may write waits first, without blocking the thread, while a worker is inside a
 * long write transaction (lib/workers/write-gate.ts): otherwise its write would wait in SQLite's
 * busy handler and stop every other request with it.
 */
const writes = (request: Request) => request.method !== "GET" && request.method !== "HEAD";

/**
 * The security headers of every API answer (the proxy in front of the pages does not run for
 * /api/: see proxy.ts). A handler's own Content-Security-Policy (a file download's) is kept.
 */
export function withSecurityHeaders(response: Response): Response {
  let secured = response;
  try {
    secured.headers.set("X-Content-Type-Options", "nosniff");
  } catch {
    // An immutable response (a redirect, a fetched one): copy it to set headers.
    secured = new Response(response.body, response);
  }
  if (!secured.headers.has("Content-Security-Policy")) secured.headers.set("Content-Security-Policy", API_CONTENT_SECURITY_POLICY);
  for (const { key, value } of commonSecurityHeaders({ production: isProduction() })) {
    if (!secured.headers.has(key)) secured.headers.set(key, value);
  }
  return secured;
}

/**
 * A route handler behind the origin check for writes (a page of another origin may not write
 * with a signed-in person's cookie), the session check, the permission matrix and a zod schema
 * (query string for GET and DELETE, JSON body otherwise, at most `maxBodyBytes`). Errors become
 * the one JSON error shape.
 */
export function route<S extends z.ZodType | undefined = undefined>(
  spec: { action: Action; schema?: S; maxBodyBytes?: number },
  handler: (args: HandlerArgs<S extends z.ZodType ? z.output<S> : undefined>) => Promise<Response> | Response,
) {
  return async (request: Request, context: RouteContext): Promise<Response> => {
    const startedAt = performance.now();
    let userId: number | undefined;
    let response: Response;
    try {
      assertSameOrigin(request);
      const { user, scope } = authorizeAction(await getRequestUser(request), spec.action);
      userId = user.id;
      const raw = spec.schema ? await readInput(request, spec.maxBodyBytes) : undefined;
      const input = parseInput(spec.schema as z.ZodType | undefined, raw);
      const params = flatParams((await context?.params) ?? {});
      if (writes(request)) await workerWritesDone();
      response = await handler({ request, params, user, scope, input: input as never });
    } catch (error) {
      response = errorResponse(error);
    }
    logOutcome(request, response.status, startedAt, userId);
    return withSecurityHeaders(response);
  };
}

/**
 * A route handler for machines: an API key in `Authorization: Bearer …` (401 when missing, wrong
 * or revoked) → the key's scope (403) → the body parses (400). No cookie is involved, so there is
 * no origin check.
 */
export function keyRoute<S extends z.ZodType>(
  spec: { scope: string; schema: S; maxBodyBytes?: number },
  handler: (args: { request: Request; key: ApiKey; input: z.output<S> }) => Promise<Response> | Response,
) {
  return async (request: Request): Promise<Response> => {
    const startedAt = performance.now();
    let response: Response;
    try {
      const key = authenticateApiKey(request.headers.get("authorization"));
      if (!key) throw new UnauthenticatedError("Send a valid API key as Authorization: Bearer <key>.");
      if (!key.scopes.includes(spec.scope)) throw new ForbiddenError(`This API key may not ${spec.scope.replace(":", " ")}.`);
      const input = parseInput(spec.schema, await readInput(request, spec.maxBodyBytes));
      if (writes(request)) await workerWritesDone();
      response = await handler({ request, key, input });
    } catch (error) {
      response = errorResponse(error);
    }
    logOutcome(request, response.status, startedAt);
    return withSecurityHeaders(response);
  };
}

/**
 * A route handler open to anonymous callers (sign-in, health). Writes still pass the origin
 * check: a foreign page may not sign a visitor in to an account of its choosing.
 */
export function publicRoute(handler: (args: PublicHandlerArgs) => Promise<Response> | Response) {
  return async (request: Request, context: RouteContext): Promise<Response> => {
    const startedAt = performance.now();
    let response: Response;
    try {
      assertSameOrigin(request);
      if (writes(request)) await workerWritesDone();
      response = await handler({ request, params: flatParams((await context?.params) ?? {}) });
    } catch (error) {
      response = errorResponse(error);
    }
    logOutcome(request, response.status, startedAt);
    return withSecurityHeaders(response);
  };
}

export { readInput };
