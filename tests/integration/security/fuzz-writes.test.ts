/**
 * Arbitrary JSON (and bytes that are not JSON at all) sent to every state-changing route, as a
 * signed-in person whose role may use it: never a 5xx, and a refused request writes nothing.
 * (Writes are counted on this process's connection; the routes that hand work to a worker thread
 * refuse these bodies before the hand-over.)
 */
import fs from "node:fs";
import path from "node:path";
import fc from "fast-check";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { seedDemo } from "@/db/seed/demo";
import { ROLES } from "@/lib/auth/permissions";
import { makeUser, sessionCookieFor } from "../helpers/world";

// Fuzzing is not abuse: let every generated request reach the route's own checks.
for (const name of ["RATE_LIMIT_WHAT_IF_USER", "RATE_LIMIT_EXPORT_USER", "RATE_LIMIT_IMPORT_USER", "RATE_LIMIT_SIGN_IN_IP", "RATE_LIMIT_SIGN_IN_ACCOUNT_IP", "RATE_LIMIT_INVITATION_IP", "RATE_LIMIT_INVITATION_ADDRESS"]) {
  process.env[name] = "1000000";
}

type Handler = (request: Request, context: { params: Promise<Record<string, string>> }) => Promise<Response>;

const API_DIR = path.join(process.cwd(), "app/api/v1");
const WRITE_METHODS = ["POST", "PUT", "PATCH", "DELETE"];
/** Multipart uploads and the catch-all are covered by their own tests; the API-key route below. */
const SKIP = new Set(["[...path]/route.ts"]);

function routeFiles(dir: string): string[] {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) return routeFiles(full);
    return entry.name === "route.ts" ? [path.relative(API_DIR, full)] : [];
  });
}

/** Field names the schemas use, so that generated objects reach past the first missing field. */
const FIELD_NAMES = [
  "email", "name", "role", "password", "next", "label", "substanceId", "mixtureId", "amount", "amountUnit", "capacity",
  "capacityUnit", "storageUnitId", "roomId", "siteId", "ownerId", "state", "kind", "comment", "reviewBy", "assigneeId",
  "tempC", "sensor", "at", "readings", "deviceId", "mapping", "timeZone", "code", "volumeM3", "designMaxTempC",
  "setPointMinC", "setPointMaxC", "casNumber", "components", "fraction", "scopes", "alerts", "findingIds", "note", "__proto__", "constructor",
];

const value = fc.oneof(
  fc.jsonValue({ maxDepth: 3 }),
  fc.constantFrom(1e308, -1e308, Number.MAX_SAFE_INTEGER, -1, 0, 0.5, "", " ", "1e308", "NaN", "Infinity", "2026-02-30", true, null, [], {}),
  fc.string({ maxLength: 300 }),
);
const objectBody = fc.dictionary(fc.constantFrom(...FIELD_NAMES), value, { maxKeys: 8 }).map((o) => JSON.stringify(o));
const body = fc.oneof(
  { weight: 6, arbitrary: objectBody },
  { weight: 2, arbitrary: fc.jsonValue({ maxDepth: 4 }).map((v) => JSON.stringify(v)) },
  { weight: 1, arbitrary: fc.string({ maxLength: 200 }) },
  { weight: 1, arbitrary: fc.uint8Array({ maxLength: 200 }) },
);

/**
 * Tables a refused request may legitimately touch: the rate-limit counters (every attempt counts)
 * and a session's last-seen time (written at most once a minute for any request).
 */
const BOOKKEEPING = new Set(["rate_limits", "sessions"]);

/**
 * Temporary triggers on every other table count the rows inserted, updated or deleted through this
 * connection; a write that is rolled back takes its count back with it.
 */
function installWriteCounter(): void {
  const sqlite = getDb().$client;
  sqlite.exec("CREATE TEMP TABLE IF NOT EXISTS fuzz_writes (n INTEGER NOT NULL); DELETE FROM fuzz_writes; INSERT INTO fuzz_writes VALUES (0);");
  const tables = sqlite.prepare("SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%' AND name NOT LIKE '__drizzle%'").all() as { name: string }[];
  for (const { name } of tables) {
    if (BOOKKEEPING.has(name)) continue;
    for (const event of ["INSERT", "UPDATE", "DELETE"]) {
      sqlite.exec(`CREATE TEMP TRIGGER IF NOT EXISTS "fuzz_${name}_${event}" AFTER ${event} ON main."${name}" BEGIN UPDATE fuzz_writes SET n = n + 1; END;`);
    }
  }
}

function fingerprint(): number {
  return (getDb().$client.prepare("SELECT n FROM fuzz_writes").get() as { n: number }).n;
}

const cookies = new Map<string, string>();
const ids = { container: "1", unit: "1", room: "1", site: "1", substance: "1", sensor: "1", finding: "1", excursion: "1", key: "1" };

beforeAll(async () => {
  await seedDemo(getDb(), { bcryptCost: 4 });
  for (const role of ROLES) cookies.set(role, await sessionCookieFor(makeUser(role)));
  installWriteCounter();
}, 120_000);

function pathAndParams(file: string): { url: string; params: Record<string, string> } {
  const params: Record<string, string> = {};
  const segments = path
    .dirname(file)
    .split("/")
    .map((segment) => {
      const name = segment.match(/^\[(\w+)\]$/)?.[1];
      if (!name) return segment;
      params[name] = name === "token" ? "0123456789abcdef0123456789abcdef" : ids.container;
      return params[name];
    });
  return { url: `http://localhost:3999/api/v1/${segments.join("/")}`, params };
}

async function send(handler: Handler, method: string, file: string, cookie: string, payload: string | Uint8Array): Promise<number> {
  const { url, params } = pathAndParams(file);
  const request = new Request(url, { method, headers: { cookie, "content-type": "application/json", origin: "http://localhost:3999" }, body: method === "DELETE" ? undefined : (payload as BodyInit) });
  const response = await handler(request, { params: Promise.resolve(params) });
  await response.arrayBuffer();
  return response.status;
}

describe("arbitrary input to every write route", () => {
  const entries = routeFiles(API_DIR)
    .filter((file) => !SKIP.has(file))
    .flatMap((file) => WRITE_METHODS.map((method) => ({ file, method })));

  it("never answers 5xx, and writes nothing when it refuses", async () => {
    let checked = 0;
    for (const { file, method } of entries) {
      const mod = (await import(/* @vite-ignore */ path.join(API_DIR, file))) as Record<string, Handler | undefined>;
      const handler = mod[method];
      if (!handler) continue;
      // The first role that gets past the permission check; for routes no role passes (the
      // API-key route), the admin's refused requests are fuzzed all the same.
      let cookie = cookies.get("admin")!;
      for (const role of ROLES) {
        const status = await send(handler, method, file, cookies.get(role)!, "{}");
        if (status !== 403 && status !== 401) {
          cookie = cookies.get(role)!;
          break;
        }
      }
      await fc.assert(
        fc.asyncProperty(body, async (payload) => {
          const before = fingerprint();
          const status = await send(handler, method, file, cookie, typeof payload === "string" ? payload : payload);
          expect(status, `${method} ${file} with ${typeof payload === "string" ? payload.slice(0, 200) : "bytes"}`).toBeLessThan(500);
          if (status >= 400) expect(fingerprint(), `${method} ${file} refused (${status}) but wrote`).toBe(before);
        }),
        { numRuns: 50, seed: 20261205 },
      );
      checked++;
    }
    expect(checked).toBeGreaterThan(30);
  }, 300_000);
});
