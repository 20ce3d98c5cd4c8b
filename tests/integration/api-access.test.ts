/**
 * Every /api/v1 route answers 401 without a session and 403 for a role that may not use it, in
 * the one JSON error shape. The table below must list every exported handler of every route
 * file: the first test fails when a route is added without being listed here.
 */
import fs from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { seedSubstanceLibrary } from "@/db/seed/substances";
import { can, ROLES, type Action } from "@/lib/auth/permissions";
import { call, makeUser, sessionCookieFor } from "./helpers/world";

type Handler = Parameters<typeof call>[0];
type Entry = { file: string; method: string; path: string; action: Action | "public" | "none"; body?: unknown; params?: Record<string, string> };

const ROUTES: Entry[] = [
  { file: "session/route.ts", method: "POST", path: "/api/v1/session", action: "public" },
  { file: "session/route.ts", method: "DELETE", path: "/api/v1/session", action: "public" },
  { file: "me/route.ts", method: "GET", path: "/api/v1/me", action: "profile.update" },
  { file: "me/route.ts", method: "PATCH", path: "/api/v1/me", action: "profile.update", body: {} },
  { file: "me/sessions/route.ts", method: "GET", path: "/api/v1/me/sessions", action: "sessions.own" },
  { file: "me/sessions/route.ts", method: "DELETE", path: "/api/v1/me/sessions", action: "sessions.own" },
  { file: "me/sessions/[id]/route.ts", method: "DELETE", path: "/api/v1/me/sessions/999999", action: "sessions.own", params: { id: "999999" } },
  { file: "users/[id]/sessions/route.ts", method: "DELETE", path: "/api/v1/users/999999/sessions", action: "users.endSessions", params: { id: "999999" } },
  { file: "users/route.ts", method: "GET", path: "/api/v1/users", action: "users.manage" },
  { file: "users/route.ts", method: "POST", path: "/api/v1/users", action: "users.manage", body: { email: "new.person@example.test", name: "New Person", role: "researcher" } },
  { file: "substances/route.ts", method: "GET", path: "/api/v1/substances?q=acet", action: "substances.read" },
  { file: "substances/[id]/route.ts", method: "PATCH", path: "/api/v1/substances/1", action: "substances.write", params: { id: "1" }, body: {} },
  { file: "substances/[id]/route.ts", method: "DELETE", path: "/api/v1/substances/999", action: "substances.write", params: { id: "999" } },
  { file: "substances/[id]/restore/route.ts", method: "POST", path: "/api/v1/substances/999/restore", action: "substances.write", params: { id: "999" } },
  { file: "sites/route.ts", method: "POST", path: "/api/v1/sites", action: "locations.write", body: {} },
  { file: "sites/[id]/route.ts", method: "GET", path: "/api/v1/sites/1", action: "locations.read", params: { id: "1" } },
  { file: "sites/[id]/route.ts", method: "PATCH", path: "/api/v1/sites/999", action: "locations.write", params: { id: "999" }, body: {} },
  { file: "rooms/route.ts", method: "POST", path: "/api/v1/rooms", action: "locations.write", body: {} },
  { file: "rooms/[id]/route.ts", method: "GET", path: "/api/v1/rooms/999", action: "locations.read", params: { id: "999" } },
  { file: "rooms/[id]/route.ts", method: "PATCH", path: "/api/v1/rooms/999", action: "locations.write", params: { id: "999" }, body: {} },
  { file: "rooms/[id]/route.ts", method: "DELETE", path: "/api/v1/rooms/999", action: "locations.write", params: { id: "999" } },
  { file: "storage-units/route.ts", method: "POST", path: "/api/v1/storage-units", action: "locations.write", body: {} },
  { file: "storage-units/[id]/route.ts", method: "GET", path: "/api/v1/storage-units/999", action: "locations.read", params: { id: "999" } },
  { file: "storage-units/[id]/route.ts", method: "PATCH", path: "/api/v1/storage-units/999", action: "locations.write", params: { id: "999" }, body: {} },
  { file: "storage-units/[id]/route.ts", method: "DELETE", path: "/api/v1/storage-units/999", action: "locations.write", params: { id: "999" } },
  { file: "storage-units/[id]/warm-up/route.ts", method: "GET", path: "/api/v1/storage-units/999/warm-up", action: "locations.read", params: { id: "999" } },
  { file: "containers/route.ts", method: "POST", path: "/api/v1/containers", action: "containers.write", body: {} },
  { file: "containers/[id]/route.ts", method: "GET", path: "/api/v1/containers/999", action: "inventory.read", params: { id: "999" } },
  { file: "containers/[id]/route.ts", method: "PATCH", path: "/api/v1/containers/999", action: "containers.write", params: { id: "999" }, body: {} },
  { file: "containers/[id]/move/route.ts", method: "POST", path: "/api/v1/containers/999/move", action: "containers.write", params: { id: "999" }, body: { storageUnitId: 1 } },
  { file: "containers/[id]/state/route.ts", method: "POST", path: "/api/v1/containers/999/state", action: "containers.write", params: { id: "999" }, body: { state: "opened" } },
  { file: "mixtures/route.ts", method: "POST", path: "/api/v1/mixtures", action: "mixtures.write", body: {} },
  { file: "substances/route.ts", method: "POST", path: "/api/v1/substances", action: "substances.write", body: {} },
  { file: "containers/route.ts", method: "GET", path: "/api/v1/containers?sort=location", action: "inventory.read" },
  { file: "sites/route.ts", method: "GET", path: "/api/v1/sites", action: "locations.read" },
  { file: "rooms/route.ts", method: "GET", path: "/api/v1/rooms?sort=site", action: "locations.read" },
  { file: "storage-units/route.ts", method: "GET", path: "/api/v1/storage-units", action: "locations.read" },
  { file: "mixtures/route.ts", method: "GET", path: "/api/v1/mixtures", action: "inventory.read" },
  { file: "audit-events/route.ts", method: "GET", path: "/api/v1/audit-events?entityType=container", action: "audit.read" },
  { file: "mixtures/[id]/route.ts", method: "GET", path: "/api/v1/mixtures/999", action: "inventory.read", params: { id: "999" } },
  { file: "substances/[id]/route.ts", method: "GET", path: "/api/v1/substances/1", action: "substances.read", params: { id: "1" } },
  { file: "substances/[id]/vapor-pressure/route.ts", method: "GET", path: "/api/v1/substances/1/vapor-pressure?tempC=20", action: "substances.read", params: { id: "1" } },
  // Multipart uploads; with no body an allowed role gets 400 (no file), never 401/403.
  { file: "containers/[id]/sds/route.ts", method: "POST", path: "/api/v1/containers/999/sds", action: "files.upload", params: { id: "999" } },
  { file: "substances/[id]/sds/route.ts", method: "POST", path: "/api/v1/substances/999/sds", action: "substances.write", params: { id: "999" } },
  // Every signed-in role passes the wrapper; who may open a file depends on what it is attached to.
  { file: "files/[id]/route.ts", method: "GET", path: "/api/v1/files/999", action: "overview.read", params: { id: "999" } },
  { file: "imports/containers/preview/route.ts", method: "POST", path: "/api/v1/imports/containers/preview", action: "containers.import" },
  { file: "imports/containers/route.ts", method: "POST", path: "/api/v1/imports/containers", action: "containers.import" },
  { file: "imports/locations/preview/route.ts", method: "POST", path: "/api/v1/imports/locations/preview", action: "locations.import" },
  { file: "imports/locations/route.ts", method: "POST", path: "/api/v1/imports/locations", action: "locations.import" },
  { file: "imports/templates/[file]/route.ts", method: "GET", path: "/api/v1/imports/templates/none.csv", action: "overview.read", params: { file: "none.csv" } },
  { file: "api-keys/route.ts", method: "GET", path: "/api/v1/api-keys", action: "apiKeys.manage" },
  { file: "api-keys/route.ts", method: "POST", path: "/api/v1/api-keys", action: "apiKeys.manage", body: {} },
  { file: "api-keys/[id]/route.ts", method: "DELETE", path: "/api/v1/api-keys/999", action: "apiKeys.manage", params: { id: "999" } },
  { file: "sensors/route.ts", method: "GET", path: "/api/v1/sensors", action: "temperatures.read" },
  { file: "sensors/route.ts", method: "POST", path: "/api/v1/sensors", action: "sensors.write", body: {} },
  { file: "sensors/[id]/route.ts", method: "GET", path: "/api/v1/sensors/999", action: "temperatures.read", params: { id: "999" } },
  { file: "sensors/[id]/route.ts", method: "PATCH", path: "/api/v1/sensors/999", action: "sensors.write", params: { id: "999" }, body: {} },
  { file: "sensors/[id]/readings/route.ts", method: "GET", path: "/api/v1/sensors/999/readings", action: "temperatures.read", params: { id: "999" } },
  // Logger-file uploads (multipart, then JSON mappings); an unknown sensor or token answers 404, an empty mapping 400.
  { file: "sensors/[id]/csv-uploads/route.ts", method: "POST", path: "/api/v1/sensors/999/csv-uploads", action: "readings.upload", params: { id: "999" } },
  { file: "sensors/[id]/csv-uploads/[token]/preview/route.ts", method: "POST", path: "/api/v1/sensors/999/csv-uploads/0123456789abcdef0123456789abcdef/preview", action: "readings.upload", params: { id: "999", token: "0123456789abcdef0123456789abcdef" }, body: {} },
  { file: "sensors/[id]/csv-uploads/[token]/import/route.ts", method: "POST", path: "/api/v1/sensors/999/csv-uploads/0123456789abcdef0123456789abcdef/import", action: "readings.upload", params: { id: "999", token: "0123456789abcdef0123456789abcdef" }, body: {} },
  { file: "excursions/route.ts", method: "GET", path: "/api/v1/excursions", action: "temperatures.read" },
  { file: "excursions/[id]/acknowledge/route.ts", method: "POST", path: "/api/v1/excursions/999/acknowledge", action: "excursions.acknowledge", params: { id: "999" }, body: {} },
  { file: "excursions/acknowledge/route.ts", method: "POST", path: "/api/v1/excursions/acknowledge", action: "excursions.acknowledge", body: {} },
  { file: "findings/route.ts", method: "GET", path: "/api/v1/findings", action: "findings.read" },
  { file: "findings/[id]/route.ts", method: "GET", path: "/api/v1/findings/999", action: "findings.read", params: { id: "999" } },
  { file: "findings/[id]/events/route.ts", method: "POST", path: "/api/v1/findings/999/events", action: "findings.comment", params: { id: "999" }, body: {} },
  { file: "findings/events/route.ts", method: "POST", path: "/api/v1/findings/events", action: "findings.comment", body: {} },
  { file: "assessments/preview/route.ts", method: "POST", path: "/api/v1/assessments/preview", action: "assessments.preview", body: {} },
  { file: "storage-plan/route.ts", method: "GET", path: "/api/v1/storage-plan?substanceId=1&amount=1&amountUnit=L", action: "containers.write" },
  { file: "settings/assessment/route.ts", method: "GET", path: "/api/v1/settings/assessment", action: "findings.read" },
  { file: "settings/assessment/route.ts", method: "PUT", path: "/api/v1/settings/assessment", action: "hazardSettings.write", body: {} },
  // A binary download: an impossible site id keeps the allowed roles' answer JSON (400); the workbook itself is tested in register-export.test.ts.
  { file: "exports/register.xlsx/route.ts", method: "GET", path: "/api/v1/exports/register.xlsx?siteId=0", action: "exports.download" },
  // The API's own OpenAPI document: public (tests/integration/openapi.test.ts).
  { file: "openapi.json/route.ts", method: "GET", path: "/api/v1/openapi.json", action: "public" },
  // Loggers authenticate with an API key, not a session (tests/integration/readings-ingest.test.ts).
  { file: "readings/route.ts", method: "POST", path: "/api/v1/readings", action: "public" },
  // The catch-all answers 404 for unknown paths whoever asks.
  ...["GET", "POST", "PUT", "PATCH", "DELETE"].map((method) => ({ file: "[...path]/route.ts", method, path: "/api/v1/no-such-thing", action: "none" as const })),
];

const API_DIR = path.join(process.cwd(), "app/api/v1");

function routeFiles(dir: string): string[] {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) return routeFiles(full);
    return entry.name === "route.ts" ? [path.relative(API_DIR, full)] : [];
  });
}

async function handlerFor(entry: Entry): Promise<Handler> {
  const mod = (await import(/* @vite-ignore */ path.join(API_DIR, entry.file))) as Record<string, Handler>;
  const handler = mod[entry.method];
  if (!handler) throw new Error(`${entry.file} has no ${entry.method}`);
  return handler;
}

beforeAll(() => {
  getDb().transaction((tx) => seedSubstanceLibrary(tx));
});

describe("the /api/v1 access table", () => {
  it("lists every exported handler of every route file", async () => {
    const exported: string[] = [];
    for (const file of routeFiles(API_DIR)) {
      const mod = (await import(/* @vite-ignore */ path.join(API_DIR, file))) as Record<string, unknown>;
      for (const method of ["GET", "POST", "PUT", "PATCH", "DELETE"]) if (typeof mod[method] === "function") exported.push(`${method} ${file}`);
    }
    expect(exported.sort()).toEqual(ROUTES.map((r) => `${r.method} ${r.file}`).sort());
  });
});

describe.each(ROUTES.filter((r) => r.action !== "public" && r.action !== "none"))("$method $path", (entry) => {
  it("answers 401 in the error shape without a session", async () => {
    const response = await call(await handlerFor(entry), { method: entry.method, path: entry.path, body: entry.body, params: entry.params });
    expect(response.status).toBe(401);
    expect(response.body).toEqual({ error: { code: "unauthenticated", message: expect.any(String) } });
  });

  it("answers 401 for a forged or stale cookie", async () => {
    const user = makeUser("admin");
    const stale = await sessionCookieFor({ id: user.id, sessionVersion: user.sessionVersion + 1 });
    const forged = "headroom_session=Fe26.2*1*forged";
    for (const cookie of [stale, forged]) {
      const response = await call(await handlerFor(entry), { method: entry.method, path: entry.path, body: entry.body, cookie, params: entry.params });
      expect(response.status).toBe(401);
    }
  });

  const refused = ROLES.filter((role) => !can(role, entry.action as Action));
  const allowed = ROLES.filter((role) => can(role, entry.action as Action));

  it.each(refused)("answers 403 for the %s role", async (role) => {
    const cookie = await sessionCookieFor(makeUser(role));
    const response = await call(await handlerFor(entry), { method: entry.method, path: entry.path, body: entry.body, cookie, params: entry.params });
    expect(response.status).toBe(403);
    expect(response.body).toEqual({ error: { code: "forbidden", message: expect.any(String) } });
  });

  // Past the permission check the answer depends on the input (200, 400, 404, 409), never 401/403.
  it.each(allowed)("lets the %s role past the permission check", async (role) => {
    const cookie = await sessionCookieFor(makeUser(role));
    const body = entry.file === "users/route.ts" && entry.body ? { ...entry.body, email: `${role}.${Math.random().toString(36).slice(2)}@example.test` } : entry.body;
    const response = await call(await handlerFor(entry), { method: entry.method, path: entry.path, body, cookie, params: entry.params });
    expect([401, 403]).not.toContain(response.status);
    expect(response.status).toBeLessThan(500);
  });
});

describe("input errors on an allowed route", () => {
  it("answers 400 with field errors after the session and role checks pass", async () => {
    const cookie = await sessionCookieFor(makeUser("admin"));
    const handler = await handlerFor(ROUTES.find((r) => r.file === "users/route.ts" && r.method === "POST")!);
    const response = await call(handler, { method: "POST", body: { email: "nope", role: "emperor" }, cookie });
    expect(response.status).toBe(400);
    expect(Object.keys(response.body.error.fields).sort()).toEqual(["email", "name", "role"]);
  });

  it("answers 409 when the invited person already has an account", async () => {
    const admin = makeUser("admin");
    const existing = makeUser("researcher");
    const handler = await handlerFor(ROUTES.find((r) => r.file === "users/route.ts" && r.method === "POST")!);
    const response = await call(handler, { method: "POST", body: { email: existing.email, name: "Again", role: "auditor" }, cookie: await sessionCookieFor(admin) });
    expect(response.status).toBe(409);
    expect(response.body.error.code).toBe("conflict");
  });
});

describe("unknown API paths", () => {
  it.each(["GET", "POST", "PUT", "PATCH", "DELETE"])("%s answers 404 in the error shape", async (method) => {
    const handler = await handlerFor({ file: "[...path]/route.ts", method, path: "/api/v1/nope", action: "none" });
    const response = await call(handler, { method, path: "/api/v1/nope" });
    expect(response.status).toBe(404);
    expect(response.body).toEqual({ error: { code: "not_found", message: "That API route was not found." } });
  });
});
