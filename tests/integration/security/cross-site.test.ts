/**
 * No page of another origin can make a signed-in person's browser write anything, and JSON
 * writes are believed only when they are JSON. The table lists every state-changing handler of
 * every route file: the first test fails when a route is added without being listed here.
 */
import fs from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { seedSubstanceLibrary } from "@/db/seed/substances";
import { makeUser, sessionCookieFor, TEST_PASSWORD } from "../helpers/world";

type Handler = (request: Request, context: { params: Promise<Record<string, string>> }) => Promise<Response>;
/** cookie: a browser with a session may reach it, so a foreign origin is refused; key: API key only; none: writes nothing. */
type Entry = { file: string; method: string; auth: "cookie" | "key" | "none" };

const WRITES: Entry[] = [
  { file: "session/route.ts", method: "POST", auth: "cookie" },
  { file: "session/route.ts", method: "DELETE", auth: "cookie" },
  { file: "me/route.ts", method: "PATCH", auth: "cookie" },
  { file: "me/sessions/route.ts", method: "DELETE", auth: "cookie" },
  { file: "me/sessions/[id]/route.ts", method: "DELETE", auth: "cookie" },
  { file: "users/[id]/sessions/route.ts", method: "DELETE", auth: "cookie" },
  { file: "users/route.ts", method: "POST", auth: "cookie" },
  { file: "substances/route.ts", method: "POST", auth: "cookie" },
  { file: "substances/[id]/route.ts", method: "PATCH", auth: "cookie" },
  { file: "substances/[id]/route.ts", method: "DELETE", auth: "cookie" },
  { file: "substances/[id]/restore/route.ts", method: "POST", auth: "cookie" },
  { file: "substances/[id]/sds/route.ts", method: "POST", auth: "cookie" },
  { file: "sites/route.ts", method: "POST", auth: "cookie" },
  { file: "sites/[id]/route.ts", method: "PATCH", auth: "cookie" },
  { file: "rooms/route.ts", method: "POST", auth: "cookie" },
  { file: "rooms/[id]/route.ts", method: "PATCH", auth: "cookie" },
  { file: "rooms/[id]/route.ts", method: "DELETE", auth: "cookie" },
  { file: "storage-units/route.ts", method: "POST", auth: "cookie" },
  { file: "storage-units/[id]/route.ts", method: "PATCH", auth: "cookie" },
  { file: "storage-units/[id]/route.ts", method: "DELETE", auth: "cookie" },
  { file: "containers/route.ts", method: "POST", auth: "cookie" },
  { file: "containers/[id]/route.ts", method: "PATCH", auth: "cookie" },
  { file: "containers/[id]/move/route.ts", method: "POST", auth: "cookie" },
  { file: "containers/[id]/state/route.ts", method: "POST", auth: "cookie" },
  { file: "containers/[id]/sds/route.ts", method: "POST", auth: "cookie" },
  { file: "mixtures/route.ts", method: "POST", auth: "cookie" },
  { file: "imports/containers/preview/route.ts", method: "POST", auth: "cookie" },
  { file: "imports/containers/route.ts", method: "POST", auth: "cookie" },
  { file: "imports/locations/preview/route.ts", method: "POST", auth: "cookie" },
  { file: "imports/locations/route.ts", method: "POST", auth: "cookie" },
  { file: "api-keys/route.ts", method: "POST", auth: "cookie" },
  { file: "api-keys/[id]/route.ts", method: "DELETE", auth: "cookie" },
  { file: "sensors/route.ts", method: "POST", auth: "cookie" },
  { file: "sensors/[id]/route.ts", method: "PATCH", auth: "cookie" },
  { file: "sensors/[id]/csv-uploads/route.ts", method: "POST", auth: "cookie" },
  { file: "sensors/[id]/csv-uploads/[token]/preview/route.ts", method: "POST", auth: "cookie" },
  { file: "sensors/[id]/csv-uploads/[token]/import/route.ts", method: "POST", auth: "cookie" },
  { file: "excursions/[id]/acknowledge/route.ts", method: "POST", auth: "cookie" },
  { file: "excursions/acknowledge/route.ts", method: "POST", auth: "cookie" },
  { file: "findings/[id]/events/route.ts", method: "POST", auth: "cookie" },
  { file: "findings/events/route.ts", method: "POST", auth: "cookie" },
  { file: "assessments/preview/route.ts", method: "POST", auth: "cookie" },
  { file: "settings/assessment/route.ts", method: "PUT", auth: "cookie" },
  // Loggers send an API key and no cookie: there is no ambient credential for a foreign page to use.
  { file: "readings/route.ts", method: "POST", auth: "key" },
  ...["POST", "PUT", "PATCH", "DELETE"].map((method) => ({ file: "[...path]/route.ts", method, auth: "none" as const })),
];

const API_DIR = path.join(process.cwd(), "app/api/v1");
const WRITE_METHODS = ["POST", "PUT", "PATCH", "DELETE"];

function routeFiles(dir: string): string[] {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) return routeFiles(full);
    return entry.name === "route.ts" ? [path.relative(API_DIR, full)] : [];
  });
}

async function handlerOf(file: string, method: string): Promise<Handler> {
  const mod = (await import(/* @vite-ignore */ path.join(API_DIR, file))) as Record<string, Handler>;
  return mod[method];
}

/** A path with every [param] replaced by 1, and those params for the handler. */
function pathAndParams(file: string): { url: string; params: Record<string, string> } {
  const params: Record<string, string> = {};
  const segments = path
    .dirname(file)
    .split("/")
    .map((segment) => {
      const name = segment.match(/^\[(?:\.\.\.)?(\w+)\]$/)?.[1];
      if (!name) return segment;
      params[name] = name === "token" ? "0123456789abcdef0123456789abcdef" : "1";
      return params[name];
    });
  return { url: `http://localhost:3999/api/v1/${segments.join("/")}`, params };
}

/** Every row of every table, as one fingerprint: a refused request must leave it as it was. */
function databaseFingerprint(): string {
  const sqlite = getDb().$client;
  const tables = sqlite.prepare("SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%' AND name NOT LIKE '__drizzle%' ORDER BY name").all() as { name: string }[];
  return tables.map(({ name }) => `${name}:${(sqlite.prepare(`SELECT count(*) AS n, total(rowid) AS s FROM "${name}"`).get() as { n: number; s: number }).n}`).join(",");
}

let adminCookie: string;

beforeAll(async () => {
  getDb().transaction((tx) => seedSubstanceLibrary(tx));
  adminCookie = await sessionCookieFor(makeUser("admin"));
});

describe("the cross-site table", () => {
  it("lists every state-changing handler of every route file", async () => {
    const exported: string[] = [];
    for (const file of routeFiles(API_DIR)) {
      const mod = (await import(/* @vite-ignore */ path.join(API_DIR, file))) as Record<string, unknown>;
      for (const method of WRITE_METHODS) if (typeof mod[method] === "function") exported.push(`${method} ${file}`);
    }
    expect(exported.sort()).toEqual(WRITES.map((r) => `${r.method} ${r.file}`).sort());
  });
});

const FOREIGN: [string, Record<string, string>][] = [
  ["an Origin of another site", { origin: "https://evil.example" }],
  ["an Origin on another port of the same host", { origin: "http://localhost:4000" }],
  ["no Origin but Sec-Fetch-Site: cross-site", { "sec-fetch-site": "cross-site" }],
  ["no Origin but Sec-Fetch-Site: same-site", { "sec-fetch-site": "same-site" }],
];

describe.each(WRITES.filter((w) => w.auth === "cookie"))("$method $file", (entry) => {
  it.each(FOREIGN)("refuses a signed-in browser's request with %s: 403 and nothing written", async (_label, extra) => {
    const { url, params } = pathAndParams(entry.file);
    const before = databaseFingerprint();
    const request = new Request(url, {
      method: entry.method,
      headers: { cookie: adminCookie, "content-type": "text/plain", ...extra },
      body: JSON.stringify({ email: "x@example.test", name: "X", role: "admin", password: TEST_PASSWORD }),
    });
    const response = await (await handlerOf(entry.file, entry.method))(request, { params: Promise.resolve(params) });
    expect(response.status).toBe(403);
    expect((await response.json()).error.code).toBe("cross_site_request");
    expect(response.headers.get("set-cookie")).toBeNull();
    expect(databaseFingerprint()).toBe(before);
  });
});

describe("the app's own pages and programs", () => {
  it("lets the app's own origin through to the usual checks", async () => {
    const handler = await handlerOf("users/route.ts", "POST");
    const request = new Request("http://localhost:3999/api/v1/users", {
      method: "POST",
      headers: { cookie: adminCookie, origin: "http://localhost:3999", "content-type": "application/json" },
      body: JSON.stringify({ email: "nope" }),
    });
    const response = await handler(request, { params: Promise.resolve({}) });
    expect(response.status).toBe(400);
    expect((await response.json()).error.code).toBe("invalid_input");
  });

  it("refuses a sign-in posted by another site (no login CSRF)", async () => {
    const user = makeUser("researcher");
    const request = new Request("http://localhost:3999/api/v1/session", {
      method: "POST",
      headers: { origin: "https://evil.example", "content-type": "application/json" },
      body: JSON.stringify({ email: user.email, password: TEST_PASSWORD }),
    });
    const response = await (await handlerOf("session/route.ts", "POST"))(request, { params: Promise.resolve({}) });
    expect(response.status).toBe(403);
    expect(response.headers.get("set-cookie")).toBeNull();
  });
});

describe("JSON bodies", () => {
  async function post(headers: Record<string, string>, body: BodyInit) {
    const before = databaseFingerprint();
    const request = new Request("http://localhost:3999/api/v1/users", { method: "POST", headers: { cookie: adminCookie, ...headers }, body, duplex: "half" } as RequestInit);
    const response = await (await handlerOf("users/route.ts", "POST"))(request, { params: Promise.resolve({}) });
    return { status: response.status, body: await response.json(), unchanged: databaseFingerprint() === before };
  }
  const invite = JSON.stringify({ email: "plain.text@example.test", name: "Plain Text", role: "admin" });

  it("refuses a text/plain body even when it holds valid JSON (415, nothing written)", async () => {
    const result = await post({ "content-type": "text/plain" }, invite);
    expect(result).toMatchObject({ status: 415, body: { error: { code: "unsupported_media_type" } }, unchanged: true });
  });

  it("refuses a form-encoded body (415)", async () => {
    const result = await post({ "content-type": "application/x-www-form-urlencoded" }, "email=a%40b.c&role=admin");
    expect(result).toMatchObject({ status: 415, unchanged: true });
  });

  it("refuses malformed UTF-8 instead of storing replacement characters (400)", async () => {
    const bytes = new Uint8Array([...new TextEncoder().encode('{"email":"bad@example.test","name":"Ren'), 0xc3, 0x28, ...new TextEncoder().encode('e","role":"auditor"}')]);
    const result = await post({ "content-type": "application/json" }, bytes);
    expect(result).toMatchObject({ status: 400, body: { error: { code: "invalid_input", message: "The request body is not valid UTF-8 text." } }, unchanged: true });
  });

  it("refuses a body over 1 MB from its Content-Length before reading it (413)", async () => {
    const big = JSON.stringify({ email: "big@example.test", name: "x".repeat(1_100_000), role: "auditor" });
    const result = await post({ "content-type": "application/json", "content-length": String(big.length) }, big);
    expect(result).toMatchObject({ status: 413, body: { error: { code: "body_too_large", message: "The request body is larger than this endpoint accepts (1 MB)." } }, unchanged: true });
  });

  it("refuses a streamed body without Content-Length as soon as it passes 1 MB (413)", async () => {
    let sent = 0;
    const chunk = new TextEncoder().encode("x".repeat(64 * 1024));
    const stream = new ReadableStream<Uint8Array>({
      pull(controller) {
        // Would go on for 100 MB if it were read to the end.
        if (sent >= 100 * 1024 * 1024) return controller.close();
        sent += chunk.byteLength;
        controller.enqueue(chunk);
      },
    });
    const result = await post({ "content-type": "application/json" }, stream);
    expect(result).toMatchObject({ status: 413, unchanged: true });
    expect(sent).toBeLessThan(2 * 1024 * 1024);
  });
});
