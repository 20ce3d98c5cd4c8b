/**
 * One documented API operation, as the route handler behaves: who may call it, what it reads, what
 * it answers, and every error status it can give. `toOpenApiOperation` turns it into zod-openapi's
 * operation object; the statuses the route wrappers add (401, 403, 400, 404, 413, 415, 429, 500)
 * follow from the description, so each operation only names its own extras.
 */
import { z } from "zod";
import type { ZodOpenApiOperationObject, ZodOpenApiResponseObject, ZodOpenApiResponsesObject } from "zod-openapi";
import { PERMISSIONS, ROLE_LABELS, ROLES, type Action, type Role } from "@/lib/auth/permissions";
import type { ApiKeyScope } from "@/lib/api-keys/scopes";
import { errorSchema, idPathSchema } from "./schemas";

export const HTTP_METHODS = ["get", "post", "put", "patch", "delete"] as const;
export type HttpMethod = (typeof HTTP_METHODS)[number];

/** The security scheme names in `components.securitySchemes`. */
export const SESSION_COOKIE_SCHEME = "sessionCookie";
export const API_KEY_SCHEME = "apiKey";

export type Access =
  /** A signed-in person whose role has this action in lib/auth/permissions.ts. */
  | { action: Action }
  /** A machine with an API key holding this scope. */
  | { apiKeyScope: ApiKeyScope }
  /** Anyone (sign-in, sign-out, this document). */
  | "public";

type Example = { summary?: string; value: unknown };

export type ApiOperation = {
  method: HttpMethod;
  /** The OpenAPI path, e.g. `/api/v1/rooms/{id}`. */
  path: string;
  tag: string;
  summary: string;
  description?: string;
  access: Access;
  /** Path parameters; `{id}` gets the numeric id by default. */
  pathParams?: z.ZodObject;
  /** The query string schema the route parses. */
  query?: z.ZodObject;
  /** The JSON body schema the route parses. */
  body?: z.ZodType;
  bodyExamples?: Record<string, Example>;
  /** A multipart upload in the field `file`. */
  upload?: { mediaTypes: string[]; maxBytes: number; description: string; extension?: string };
  success: {
    status: 200 | 201 | 202 | 204;
    description: string;
    /** JSON answer; omitted with `binary` or for 204. */
    schema?: z.ZodType;
    example?: unknown;
    /** A download: its media types. */
    binary?: string[];
    headers?: Record<string, string>;
  };
  /** Statuses beyond those the wrappers give, with what they mean here. */
  errors?: Partial<Record<400 | 401 | 403 | 404 | 409 | 413 | 422 | 429, string>>;
  /** Calls `limit()` from lib/rate-limit: 429 with Retry-After. */
  rateLimited?: string;
  /** Runs in a worker thread: 503 `server_busy` when the queue is full (lib/workers/pool.ts). */
  workerThread?: string;
  /** Writes with a JSON body at most this large (default 1 MiB: lib/limits.ts). */
  maxBodyBytes?: number;
};

function formatMiB(bytes: number): string {
  return `${Math.round(bytes / (1024 * 1024))} MB`;
}

/** "Administrator, Safety officer; Researcher (own records only)". */
export function rolesText(action: Action): string {
  const row = PERMISSIONS[action] as Partial<Record<Role, "all" | "own">>;
  const entries = Object.entries(row) as [Role, "all" | "own"][];
  const all = entries.filter(([, scope]) => scope === "all").map(([role]) => ROLE_LABELS[role]);
  const own = entries.filter(([, scope]) => scope === "own").map(([role]) => ROLE_LABELS[role]);
  return [all.join(", "), own.length ? `${own.join(", ")} (only what they own or look after)` : ""].filter(Boolean).join("; ");
}

/** What each error status typically answers, for the reference's examples. */
const ERROR_EXAMPLES: Record<string, { code: string; message: string; fields?: Record<string, string[]> }> = {
  "400": { code: "invalid_input", message: "Check the highlighted fields.", fields: { amount: ["Amount must be from 0 to 1000000."] } },
  "401": { code: "unauthenticated", message: "Sign in to continue." },
  "403": { code: "forbidden", message: "Your role does not allow this." },
  "404": { code: "not_found", message: "That storage unit was not found." },
  "409": { code: "conflict", message: "Storage unit FC-2 still holds 4 containers; move or dispose of them first." },
  "413": { code: "body_too_large", message: "The request body is larger than this endpoint accepts (1 MB)." },
  "415": { code: "unsupported_media_type", message: "Send the request body as JSON with the header Content-Type: application/json." },
  "422": { code: "insufficient_data", message: "Acetone: no vapor-pressure correlation covers 250 °C." },
  "429": { code: "rate_limited", message: "Too many requests. Try again in 1 minute." },
  "500": { code: "internal_error", message: "Something went wrong on our side. The error was logged." },
  "503": { code: "server_busy", message: "The server is busy with other imports and exports. Try again in a minute." },
};

function errorResponse(status: string, description: string, options: { headers?: ZodOpenApiResponseObject["headers"]; example?: { code: string; message: string } } = {}): ZodOpenApiResponseObject {
  const example = options.example ?? ERROR_EXAMPLES[status];
  return {
    description,
    content: { "application/json": { schema: errorSchema, ...(example ? { example: { error: example } } : {}) } },
    ...(options.headers ? { headers: options.headers } : {}),
  };
}

const retryAfter = z.object({
  "Retry-After": z.string().meta({ description: "Seconds to wait before trying again.", example: "60" }),
});

function pathParamNames(path: string): string[] {
  return [...path.matchAll(/\{([^}]+)\}/g)].map((m) => m[1]);
}

export function toOpenApiOperation(op: ApiOperation): ZodOpenApiOperationObject {
  const writes = op.method !== "get";
  const responses: ZodOpenApiResponsesObject = {};

  const success: ZodOpenApiResponseObject = { description: op.success.description };
  if (op.success.binary) {
    success.content = Object.fromEntries(op.success.binary.map((type) => [type, { schema: { type: "string", contentMediaType: type } }]));
  } else if (op.success.schema) {
    success.content = { "application/json": { schema: op.success.schema, ...(op.success.example !== undefined ? { example: op.success.example } : {}) } };
  }
  if (op.success.headers) {
    success.headers = Object.fromEntries(Object.entries(op.success.headers).map(([name, description]) => [name, { description, schema: { type: "string" } }]));
  }
  responses[String(op.success.status) as "200"] = success;

  const hasInput = Boolean(op.query || op.body || op.upload);
  const params = pathParamNames(op.path);
  const bad = [op.errors?.[400], hasInput ? "The input does not parse: `fields` names each problem." : undefined, op.body ? "The body is not valid JSON or UTF-8." : undefined].filter(Boolean);
  if (bad.length) responses["400"] = errorResponse("400", bad.join(" "));

  if (op.errors?.[401]) responses["401"] = errorResponse("401", op.errors[401], { example: { code: "invalid_credentials", message: "That e-mail address and password do not match an active account." } });
  else if (op.access !== "public") {
    responses["401"] =
      "apiKeyScope" in op.access
        ? errorResponse("401", "No API key, or an unknown or revoked one, in `Authorization: Bearer …`.", { example: { code: "unauthenticated", message: "Send a valid API key as Authorization: Bearer <key>." } })
        : errorResponse("401", "Not signed in, or the session has ended.");
  }
  const forbidden: string[] = [];
  if (op.access !== "public" && "action" in op.access) {
    const row = PERMISSIONS[op.access.action] as Partial<Record<Role, string>>;
    // A permission every role has all of never refuses anyone by role.
    if (ROLES.some((role) => !row[role])) forbidden.push(`Your role may not do this (allowed: ${rolesText(op.access.action)}).`);
    if (Object.values(row).includes("own")) forbidden.push("Your role may do this only for what you own or look after.");
  }
  if (op.errors?.[403]) forbidden.push(op.errors[403]);
  if (op.access !== "public" && "apiKeyScope" in op.access) forbidden.push(`The key lacks the scope \`${op.access.apiKeyScope}\`.`);
  if (writes && !(op.access !== "public" && "apiKeyScope" in op.access)) forbidden.push("A write sent from a page of another origin is refused.");
  if (forbidden.length) responses["403"] = errorResponse("403", forbidden.join(" "));

  if (params.length || op.errors?.[404]) responses["404"] = errorResponse("404", op.errors?.[404] ?? "No such record.");
  if (op.errors?.[409]) responses["409"] = errorResponse("409", op.errors[409]);
  if (op.body || op.upload || op.errors?.[413]) {
    responses["413"] = op.upload
      ? errorResponse("413", op.errors?.[413] ?? `The file is larger than ${formatMiB(op.upload.maxBytes)}.`, {
          example: { code: "file_too_large", message: `The file is larger than ${formatMiB(op.upload.maxBytes)}.` },
        })
      : errorResponse("413", op.errors?.[413] ?? `The body is larger than ${formatMiB(op.maxBodyBytes ?? 1024 * 1024)}.`, {
          example: { code: "body_too_large", message: `The request body is larger than this endpoint accepts (${formatMiB(op.maxBodyBytes ?? 1024 * 1024)}).` },
        });
  }
  if (op.body) responses["415"] = errorResponse("415", "The body is not declared as `Content-Type: application/json`.");
  if (op.errors?.[422]) responses["422"] = errorResponse("422", op.errors[422]);
  if (op.rateLimited || op.errors?.[429]) responses["429"] = errorResponse("429", op.rateLimited ?? op.errors![429]!, { headers: retryAfter });
  if (op.workerThread) responses["503"] = errorResponse("503", op.workerThread);
  responses["500"] = errorResponse("500", "Something failed on the server; the error was logged.");

  const security =
    op.access === "public" ? [] : "apiKeyScope" in op.access ? [{ [API_KEY_SCHEME]: [op.access.apiKeyScope] }] : [{ [SESSION_COOKIE_SCHEME]: [] }];

  const who =
    op.access === "public"
      ? "**Access:** anyone, no sign-in."
      : "apiKeyScope" in op.access
        ? `**Access:** an API key with the scope \`${op.access.apiKeyScope}\` (no session).`
        : `**Access:** the session cookie; permission \`${op.access.action}\`: ${rolesText(op.access.action)}.`;

  const requestParams: ZodOpenApiOperationObject["requestParams"] = {};
  if (params.length) requestParams.path = op.pathParams ?? idPathSchema;
  if (op.query) requestParams.query = op.query;

  const operation: ZodOpenApiOperationObject = {
    tags: [op.tag],
    summary: op.summary,
    description: [op.description, who].filter(Boolean).join("\n\n"),
    operationId: `${op.method}${op.path.replace(/^\/api\/v1/, "").replace(/[{}]/g, "").replace(/[^a-zA-Z0-9]+(.)?/g, (_, c: string | undefined) => (c ? c.toUpperCase() : ""))}`,
    security,
    ...(Object.keys(requestParams).length ? { requestParams } : {}),
    responses,
  };
  if (op.access !== "public") {
    operation["x-headroom-access"] = "action" in op.access ? { action: op.access.action, roles: PERMISSIONS[op.access.action] } : { apiKeyScope: op.access.apiKeyScope };
  }
  if (op.body) {
    operation.requestBody = {
      required: true,
      content: { "application/json": { schema: op.body, ...(op.bodyExamples ? { examples: op.bodyExamples } : {}) } },
    };
  } else if (op.upload) {
    operation.requestBody = {
      required: true,
      description: op.upload.description,
      content: {
        "multipart/form-data": {
          schema: {
            type: "object",
            required: ["file"],
            properties: { file: { type: "string", format: "binary", contentMediaType: op.upload.mediaTypes[0], description: `${op.upload.mediaTypes.join(" or ")}, at most ${formatMiB(op.upload.maxBytes)}.` } },
          },
        },
      },
    };
  }
  return operation;
}
