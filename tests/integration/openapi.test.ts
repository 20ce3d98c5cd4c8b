/**
 * The API document and the route files stay in step: every exported handler under app/api/v1 is
 * documented and every documented operation has its handler; the document is valid OpenAPI 3.1;
 * every operation states its security and its errors in the shared error shape; the examples
 * parse with their own schemas; every webhook event is documented once, with its payload schema.
 */
import fs from "node:fs";
import path from "node:path";
import { Validator } from "@seriousme/openapi-schema-validator";
import { describe, expect, it } from "vitest";
import { z } from "zod";
import { API_OPERATIONS, apiDocument } from "@/lib/api-docs/document";
import { HTTP_METHODS } from "@/lib/api-docs/operation";
import { ROLES, scopeFor, type Action } from "@/lib/auth/permissions";
import * as docSchemas from "@/lib/api-docs/schemas";
import * as webhookSchemas from "@/lib/api-docs/webhooks";
import { RETRY_DELAYS_MS } from "@/lib/webhooks/deliver";
import { WEBHOOK_EVENT_TYPES } from "@/lib/webhooks/events";
import { GET as openApiJson } from "@/app/api/v1/openapi.json/route";
import { call } from "./helpers/world";

const API_DIR = path.join(process.cwd(), "app/api/v1");
/** The JSON 404 for unknown paths under /api/v1: not an API path of its own, so not documented. */
const CATCH_ALL = "[...path]/route.ts";

function routeFiles(dir: string): string[] {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) return routeFiles(full);
    return entry.name === "route.ts" ? [path.relative(API_DIR, full)] : [];
  });
}

/** `rooms/[id]/route.ts` → `/api/v1/rooms/{id}`. */
function pathOf(file: string): string {
  const dir = path.dirname(file);
  return `/api/v1/${dir}`.replace(/\[([^\]]+)\]/g, "{$1}");
}

type Operation = {
  security?: Record<string, string[]>[];
  responses: Record<string, { content?: Record<string, { schema?: { $ref?: string } }> }>;
};
type WebhookItem = {
  post: {
    tags: string[];
    parameters: { in: string; name: string; required: boolean; description: string }[];
    requestBody: { required: boolean; content: Record<string, { schema: { $ref?: string } }> };
    responses: Record<string, { description: string }>;
  };
};
const doc = apiDocument() as unknown as {
  paths: Record<string, Record<string, Operation>>;
  webhooks: Record<string, WebhookItem>;
  tags: { name: string }[];
  info: { description: string };
  components: { schemas: Record<string, unknown> };
};

describe("the API document and the route handlers", () => {
  it("documents every exported handler under app/api/v1 and nothing else", async () => {
    const handlers: string[] = [];
    for (const file of routeFiles(API_DIR)) {
      if (file === CATCH_ALL) continue;
      const mod = (await import(/* @vite-ignore */ path.join(API_DIR, file))) as Record<string, unknown>;
      for (const method of HTTP_METHODS) if (typeof mod[method.toUpperCase()] === "function") handlers.push(`${method.toUpperCase()} ${pathOf(file)}`);
    }
    const documented = Object.entries(doc.paths).flatMap(([p, item]) => Object.keys(item).filter((k) => (HTTP_METHODS as readonly string[]).includes(k)).map((m) => `${m.toUpperCase()} ${p}`));
    expect(documented.sort()).toEqual(handlers.sort());
    expect(handlers.length).toBe(75);
  });

  it("leaves out the catch-all, which answers 404 for any unknown path", () => {
    expect(Object.keys(doc.paths).some((p) => p.includes("path"))).toBe(false);
  });

  it("is a valid OpenAPI 3.1 document", async () => {
    const validator = new Validator();
    const result = await validator.validate(doc as never);
    expect(validator.version).toBe("3.1");
    expect(result.errors).toBeUndefined();
    expect(result.valid).toBe(true);
  });

  it("names the security of every operation: a scheme, or none for the public ones", () => {
    const schemes = Object.keys((doc.components as unknown as { securitySchemes: Record<string, unknown> }).securitySchemes).sort();
    expect(schemes).toEqual(["apiKey", "sessionCookie"]);
    const publicOnes: string[] = [];
    for (const [p, item] of Object.entries(doc.paths)) {
      for (const [method, op] of Object.entries(item)) {
        expect(op.security, `${method} ${p}`).toBeDefined();
        if (op.security!.length === 0) publicOnes.push(`${method.toUpperCase()} ${p}`);
        for (const requirement of op.security!) for (const name of Object.keys(requirement)) expect(schemes).toContain(name);
      }
    }
    expect(publicOnes.sort()).toEqual(["DELETE /api/v1/session", "GET /api/v1/openapi.json", "POST /api/v1/session"]);
    expect(doc.paths["/api/v1/readings"].post.security).toEqual([{ apiKey: ["readings:write"] }]);
    expect(doc.paths["/api/v1/findings"].get.security).toEqual([{ sessionCookie: [] }]);
    // Every role may read the substance library: no 403 by role; only administrators manage keys.
    expect(doc.paths["/api/v1/substances"].get.responses["403"]).toBeUndefined();
    expect(Object.keys(doc.paths["/api/v1/api-keys"].get.responses)).toContain("403");
  });

  it("gives every operation error answers in the shared error shape", () => {
    for (const [p, item] of Object.entries(doc.paths)) {
      for (const [method, op] of Object.entries(item)) {
        const errors = Object.entries(op.responses).filter(([status]) => Number(status) >= 400);
        expect(errors.length, `${method} ${p}`).toBeGreaterThan(0);
        for (const [status, response] of errors) expect(response.content?.["application/json"]?.schema?.$ref, `${method} ${p} ${status}`).toBe("#/components/schemas/Error");
        // Signed-in routes: 401 always; 403 where a role is refused, a scope is "own", or it writes; path ids: 404.
        if (op.security!.length > 0) expect(Object.keys(op.responses), `${method} ${p}`).toContain("401");
        const access = (op as unknown as { "x-headroom-access"?: { action?: Action } })["x-headroom-access"];
        const refusesSomeone = access?.action ? ROLES.some((role) => scopeFor(role, access.action!) !== "all") : true;
        if (op.security!.length > 0 && (refusesSomeone || method !== "get")) expect(Object.keys(op.responses), `${method} ${p}`).toContain("403");
        if (p.includes("{")) expect(Object.keys(op.responses)).toContain("404");
      }
    }
  });

  it("documents 429 with Retry-After on the limited routes", () => {
    const limited = ["/api/v1/readings", "/api/v1/assessments/preview", "/api/v1/imports/containers", "/api/v1/sensors/{id}/csv-uploads", "/api/v1/session"];
    for (const p of limited) {
      const op = Object.values(doc.paths[p])[0] as Operation & { responses: Record<string, { headers?: Record<string, unknown> }> };
      expect(op.responses["429"]?.headers?.["Retry-After"], p).toBeDefined();
    }
    expect((doc.paths["/api/v1/storage-plan"].get.responses as Record<string, { headers?: object }>)["429"].headers).toHaveProperty("Retry-After");
    expect((doc.paths["/api/v1/exports/register.xlsx"].get.responses as Record<string, { headers?: object }>)["429"].headers).toHaveProperty("Retry-After");
  });

  it("documents the workbook download and the uploads by their media types", () => {
    const xlsx = doc.paths["/api/v1/exports/register.xlsx"].get.responses["200"].content!;
    expect(Object.keys(xlsx)).toEqual(["application/vnd.openxmlformats-officedocument.spreadsheetml.sheet"]);
    const upload = (doc.paths["/api/v1/containers/{id}/sds"].post as unknown as { requestBody: { content: Record<string, unknown> } }).requestBody.content;
    expect(Object.keys(upload)).toEqual(["multipart/form-data"]);
    expect(Object.keys(doc.paths["/api/v1/files/{id}"].get.responses["200"].content!)).toEqual(["application/pdf"]);
  });

  it("takes the list query parameters from the routes' own schemas", () => {
    const params = (doc.paths["/api/v1/containers"].get as unknown as { parameters: { name: string; in: string; schema: { enum?: string[] } }[] }).parameters;
    const names = params.map((p) => p.name);
    expect(names).toEqual(expect.arrayContaining(["page", "pageSize", "sort", "dir", "q", "state", "siteId", "roomId"]));
    expect(params.find((p) => p.name === "sort")!.schema.enum).toEqual(["label", "substance", "amount", "state", "location", "owner", "updatedAt", "expiresAt"]);
    const findingSorts = (doc.paths["/api/v1/findings"].get as unknown as { parameters: { name: string; schema: { enum?: string[] } }[] }).parameters.find((p) => p.name === "sort")!;
    expect(findingSorts.schema.enum).toContain("timeToDanger");
  });

  it("has examples that parse with their own schemas", () => {
    let checked = 0;
    for (const op of API_OPERATIONS) {
      for (const [name, example] of Object.entries(op.bodyExamples ?? {})) {
        const parsed = (op.body as z.ZodType).safeParse(example.value);
        expect(parsed.success, `${op.method} ${op.path} example ${name}: ${parsed.error?.message}`).toBe(true);
        checked += 1;
      }
      if (op.success.example !== undefined && op.success.schema) {
        const parsed = op.success.schema.safeParse(op.success.example);
        expect(parsed.success, `${op.method} ${op.path} answer example: ${parsed.error?.message}`).toBe(true);
        checked += 1;
      }
    }
    expect(checked).toBeGreaterThanOrEqual(25);
  });

  it("has schema examples that parse with their own schemas", () => {
    let checked = 0;
    for (const [name, value] of Object.entries(docSchemas)) {
      if (!(value instanceof z.ZodType)) continue;
      const example = z.globalRegistry.get(value)?.example;
      if (example === undefined) continue;
      const parsed = value.safeParse(example);
      expect(parsed.success, `${name}: ${parsed.error?.message}`).toBe(true);
      checked += 1;
    }
    expect(checked).toBeGreaterThanOrEqual(10);
  });

  it("gives each error answer an example in the error shape with the status's own code", () => {
    const codes: Record<string, string[]> = {};
    for (const item of Object.values(doc.paths)) {
      for (const op of Object.values(item)) {
        for (const [status, response] of Object.entries(op.responses)) {
          if (Number(status) < 400) continue;
          const example = (response.content?.["application/json"] as { example?: unknown } | undefined)?.example;
          expect(docSchemas.errorSchema.safeParse(example).success, status).toBe(true);
          (codes[status] ??= []).push((example as { error: { code: string } }).error.code);
        }
      }
    }
    expect(new Set(codes["403"])).toEqual(new Set(["forbidden"]));
    expect(new Set(codes["429"])).toEqual(new Set(["rate_limited"]));
    expect(new Set(codes["401"])).toEqual(new Set(["unauthenticated", "invalid_credentials"]));
    expect(new Set(codes["413"])).toEqual(new Set(["body_too_large", "file_too_large"]));
  });
});

describe("GET /api/v1/openapi.json", () => {
  it("answers the document without a session, as JSON, cacheable", async () => {
    const response = await call(openApiJson, { path: "/api/v1/openapi.json" });
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toContain("application/json");
    expect(response.headers.get("cache-control")).toBe("public, max-age=300");
    expect(response.body.openapi).toBe("3.1.0");
    expect(response.body.info.title).toBe("Headroom API");
    expect(response.body.info.description).toContain("screening estimates");
    expect(response.body.servers).toEqual([{ url: "/", description: "This Headroom installation" }]);
    expect(response.body.components.securitySchemes.sessionCookie).toMatchObject({ type: "apiKey", in: "cookie", name: "headroom_session" });
    expect(response.body.components.securitySchemes.apiKey).toMatchObject({ type: "http", scheme: "bearer" });
  });
});

describe("the webhook events in the document", () => {
  it("documents every event name once, and only those", () => {
    expect(Object.keys(doc.webhooks).sort()).toEqual([...WEBHOOK_EVENT_TYPES].sort());
    expect(Object.keys(webhookSchemas.WEBHOOK_PAYLOAD_SCHEMAS).sort()).toEqual([...WEBHOOK_EVENT_TYPES].sort());
    for (const [name, item] of Object.entries(doc.webhooks)) expect(Object.keys(item), name).toEqual(["post"]);
  });

  it("gives each a JSON body in its own schema, the signature headers, the answers and the tag", () => {
    expect(doc.tags.map((t) => t.name)).toContain(webhookSchemas.WEBHOOKS_TAG);
    for (const [name, { post }] of Object.entries(doc.webhooks)) {
      expect(post.tags, name).toEqual([webhookSchemas.WEBHOOKS_TAG]);
      expect(post.requestBody.required).toBe(true);
      const ref = post.requestBody.content["application/json"].schema.$ref!;
      expect(ref, name).toMatch(/^#\/components\/schemas\/\w+Event$/);
      const schema = doc.components.schemas[ref.split("/").pop()!] as { properties: { type: { const: string } }; additionalProperties: boolean };
      expect(schema.properties.type.const).toBe(name);
      expect(schema.additionalProperties).toBe(false);
      const headers = post.parameters.filter((p) => p.in === "header");
      expect(headers.map((h) => h.name)).toEqual(["webhook-id", "webhook-timestamp", "webhook-signature"]);
      expect(headers.every((h) => h.required && h.description.length > 20)).toBe(true);
      expect(Object.keys(post.responses).sort()).toEqual(["2XX", "default"]);
    }
    const signature = doc.webhooks["finding.raised"].post.parameters.find((p) => p.name === "webhook-signature")!;
    expect(signature.description).toContain("HMAC-SHA256");
    expect(signature.description).toContain("whsec_");
    expect(doc.webhooks["finding.raised"].post.parameters.find((p) => p.name === "webhook-timestamp")!.description).toContain("5 minutes");
    expect(doc.info.description).toContain("Admin → Webhooks");
  });

  it("states the retry schedule of lib/webhooks/deliver.ts", () => {
    expect(RETRY_DELAYS_MS).toEqual([30_000, 120_000, 600_000, 3_600_000, 21_600_000, 86_400_000]);
    expect(webhookSchemas.RETRY_SCHEDULE_TEXT).toBe("30 s, 2 min, 10 min, 1 h, 6 h, 24 h");
    expect(doc.webhooks["excursion.ended"].post.responses.default.description).toContain(webhookSchemas.RETRY_SCHEDULE_TEXT);
  });

  it("has payload examples that parse with their own schemas, and strict objects that refuse an undocumented field", () => {
    let checked = 0;
    for (const [name, value] of Object.entries(webhookSchemas)) {
      if (!(value instanceof z.ZodType)) continue;
      const example = z.globalRegistry.get(value)?.example;
      if (example === undefined) continue;
      const parsed = value.safeParse(example);
      expect(parsed.success, `${name}: ${parsed.error?.message}`).toBe(true);
      checked += 1;
    }
    expect(checked).toBe(WEBHOOK_EVENT_TYPES.length + 1);
    for (const type of WEBHOOK_EVENT_TYPES) {
      const schema = webhookSchemas.WEBHOOK_PAYLOAD_SCHEMAS[type];
      const example = z.globalRegistry.get(schema)!.example as { data: Record<string, unknown> };
      expect(schema.safeParse({ ...example, data: { ...example.data, extra: 1 } }).success, type).toBe(false);
      expect(schema.safeParse({ ...example, type: "finding.other" }).success, type).toBe(false);
    }
  });
});
