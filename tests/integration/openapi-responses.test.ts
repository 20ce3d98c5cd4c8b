/**
 * The answers the API document promises are the answers the routes give: real answers from the
 * invented demo organisation, parsed with the document's response schemas, with exactly the keys
 * the schemas name (nothing undocumented, nothing missing).
 */
import { beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { storageUnits, substances, users, type User } from "@/db/schema";
import { seedDemo } from "@/db/seed/demo";
import { DEMO_INGEST_KEY } from "@/db/seed/demo-readings";
import * as apiKeysRoute from "@/app/api/v1/api-keys/route";
import * as containersRoute from "@/app/api/v1/containers/route";
import * as findingsRoute from "@/app/api/v1/findings/route";
import * as meRoute from "@/app/api/v1/me/route";
import * as mySessionsRoute from "@/app/api/v1/me/sessions/route";
import * as readingsRoute from "@/app/api/v1/readings/route";
import * as storagePlanRoute from "@/app/api/v1/storage-plan/route";
import * as previewRoute from "@/app/api/v1/assessments/preview/route";
import * as usersRoute from "@/app/api/v1/users/route";
import * as sitesRoute from "@/app/api/v1/sites/route";
import * as siteRoute from "@/app/api/v1/sites/[id]/route";
import * as roomsRoute from "@/app/api/v1/rooms/route";
import * as roomRoute from "@/app/api/v1/rooms/[id]/route";
import * as unitsRoute from "@/app/api/v1/storage-units/route";
import * as unitRoute from "@/app/api/v1/storage-units/[id]/route";
import * as containerRoute from "@/app/api/v1/containers/[id]/route";
import * as containerMoveRoute from "@/app/api/v1/containers/[id]/move/route";
import * as containerStateRoute from "@/app/api/v1/containers/[id]/state/route";
import * as mixturesRoute from "@/app/api/v1/mixtures/route";
import * as mixtureRoute from "@/app/api/v1/mixtures/[id]/route";
import * as sensorsRoute from "@/app/api/v1/sensors/route";
import * as sensorRoute from "@/app/api/v1/sensors/[id]/route";
import * as sensorReadingsRoute from "@/app/api/v1/sensors/[id]/readings/route";
import * as excursionsRoute from "@/app/api/v1/excursions/route";
import * as excursionAckRoute from "@/app/api/v1/excursions/[id]/acknowledge/route";
import * as substancesRoute from "@/app/api/v1/substances/route";
import * as substanceRoute from "@/app/api/v1/substances/[id]/route";
import * as vaporRoute from "@/app/api/v1/substances/[id]/vapor-pressure/route";
import * as findingRoute from "@/app/api/v1/findings/[id]/route";
import * as findingEventsRoute from "@/app/api/v1/findings/[id]/events/route";
import * as settingsRoute from "@/app/api/v1/settings/assessment/route";
import * as auditRoute from "@/app/api/v1/audit-events/route";
import * as containerSdsRoute from "@/app/api/v1/containers/[id]/sds/route";
import * as containerImportRoute from "@/app/api/v1/imports/containers/route";
import * as containerImportPreviewRoute from "@/app/api/v1/imports/containers/preview/route";
import * as locationImportPreviewRoute from "@/app/api/v1/imports/locations/preview/route";
import * as warmUpRoute from "@/app/api/v1/storage-units/[id]/warm-up/route";
import { locationTemplateCsv } from "@/lib/imports";
import * as csvUploadsRoute from "@/app/api/v1/sensors/[id]/csv-uploads/route";
import * as csvPreviewRoute from "@/app/api/v1/sensors/[id]/csv-uploads/[token]/preview/route";
import * as csvImportRoute from "@/app/api/v1/sensors/[id]/csv-uploads/[token]/import/route";
import { sensors } from "@/db/schema";
import { API_OPERATIONS } from "@/lib/api-docs/document";
import { errorSchema } from "@/lib/api-docs/schemas";
import { DEMO_GATEWAY_KEY } from "@/lib/api-docs/operations/temperatures";
import { keyProblems } from "./helpers/documented-keys";
import { call, sessionCookieFor } from "./helpers/world";

let safety: User;
let admin: User;

beforeAll(async () => {
  await seedDemo(getDb(), { bcryptCost: 4 });
  safety = getDb().select().from(users).where(eq(users.email, "safety@example.org")).get()!;
  admin = getDb().select().from(users).where(eq(users.email, "admin@example.org")).get()!;
});

/** The documented answer schema of one operation and status. */
function documented(method: string, path: string): z.ZodType {
  const op = API_OPERATIONS.find((o) => o.method === method && o.path === path);
  if (!op?.success.schema) throw new Error(`${method} ${path} has no documented answer schema`);
  return op.success.schema;
}

/** The object schema's own keys, through the list envelope's `data` when asked. */
function keysOf(schema: z.ZodType): string[] {
  return Object.keys((schema as z.ZodObject).shape).sort();
}

function rowSchema(listSchema: z.ZodType): z.ZodObject {
  return ((listSchema as z.ZodObject).shape.data as z.ZodArray<z.ZodObject>).element;
}

/** The answer parses with the documented schema and has exactly its keys, all the way down. */
function expectDocumented(method: string, path: string, body: unknown) {
  const schema = documented(method, path);
  const parsed = schema.safeParse(body);
  expect(parsed.success, `${method} ${path}: ${parsed.error?.message}`).toBe(true);
  expect(keyProblems(schema, body), `${method} ${path}`).toEqual([]);
}

/** Parses the answer with the documented schema and checks that each row has exactly its keys. */
function expectListMatches(body: unknown, listSchema: z.ZodType) {
  const parsed = listSchema.safeParse(body);
  expect(parsed.success, parsed.error?.message).toBe(true);
  const rows = (body as { data: Record<string, unknown>[] }).data;
  expect(rows.length).toBeGreaterThan(0);
  const row = rowSchema(listSchema);
  for (const r of rows) expect(Object.keys(r).sort()).toEqual(keysOf(row));
  return rows;
}

describe("documented answers match real ones", () => {
  it("GET /api/v1/findings: a page of register rows", async () => {
    const response = await call(findingsRoute.GET, { path: "/api/v1/findings?pageSize=100", cookie: await sessionCookieFor(safety) });
    expect(response.status).toBe(200);
    const rows = expectListMatches(response.body, documented("get", "/api/v1/findings"));
    expect(Object.keys(response.body).sort()).toEqual(["data", "page", "pageSize", "total"]);
    expect(Object.keys(rows[0].location as object).sort()).toEqual(["label", "roomCode", "roomId", "siteId", "siteName", "storageUnitId", "unitCode"]);
  });

  it("GET /api/v1/containers: a page of containers with their worst open finding", async () => {
    const response = await call(containersRoute.GET, { path: "/api/v1/containers?pageSize=100", cookie: await sessionCookieFor(safety) });
    expect(response.status).toBe(200);
    const rows = expectListMatches(response.body, documented("get", "/api/v1/containers"));
    expect(rows.some((r) => r.openFindingSeverity !== null)).toBe(true);
  });

  it("GET /api/v1/storage-plan: ranked places", async () => {
    const response = await call(storagePlanRoute.GET, { path: "/api/v1/storage-plan?substanceId=1&amount=1&amountUnit=L", cookie: await sessionCookieFor(safety) });
    expect(response.status).toBe(200);
    expectListMatches(response.body, documented("get", "/api/v1/storage-plan"));
  });

  it("POST /api/v1/assessments/preview: what a new bottle would raise, with safer places", async () => {
    const ether = getDb().select().from(substances).where(eq(substances.cas, "60-29-7")).get()!;
    const fridge = getDb().select().from(storageUnits).where(eq(storageUnits.code, "FR-1")).get()!;
    const response = await call(previewRoute.POST, { method: "POST", cookie: await sessionCookieFor(safety), body: { storageUnitId: fridge.id, substanceId: ether.id, amount: 2.5, amountUnit: "L" } });
    expect(response.status).toBe(200);
    expect(response.body.data.verdict).not.toBe("no_findings");
    expect(response.body.data.alternatives.length).toBeGreaterThan(0);
    expectDocumented("post", "/api/v1/assessments/preview", response.body);
  });

  it("POST /api/v1/readings: the ingest counts, and a refused batch in the error shape with its rows", async () => {
    const at = new Date(Date.now() - 5 * 60_000).toISOString().replace(/\.\d+Z$/, "Z");
    const authorization = `Bearer ${DEMO_INGEST_KEY}`;
    const accepted = await call(readingsRoute.POST, { method: "POST", headers: { authorization }, body: { readings: [{ sensor: "S-202", at, tempC: 21.4 }] } });
    expect(accepted.status).toBe(202);
    const schema = documented("post", "/api/v1/readings");
    expect(schema.safeParse(accepted.body).success).toBe(true);
    expect(Object.keys(accepted.body).sort()).toEqual(keysOf(schema));
    expect(accepted.body).toEqual({ accepted: 1, duplicates: 0, conflicts: 0, conflictRows: [] });

    const refused = await call(readingsRoute.POST, { method: "POST", headers: { authorization }, body: { readings: [{ sensor: "S-202", at, tempC: "warm" }] } });
    expect(refused.status).toBe(400);
    expect(errorSchema.safeParse(refused.body).success).toBe(true);
    expect(refused.body.error.code).toBe("batch_rejected");
    expect(refused.body.error.rows[0]).toMatchObject({ index: 0, field: "tempC" });
  });

  it("names the demo gateway's key as the seed stores it", () => {
    expect(DEMO_GATEWAY_KEY).toBe(DEMO_INGEST_KEY);
    expect(API_OPERATIONS.find((o) => o.path === "/api/v1/readings")!.description).toContain(`Authorization: Bearer ${DEMO_INGEST_KEY}`);
  });

  it("the documented example batch is the shape the ingest takes", async () => {
    const op = API_OPERATIONS.find((o) => o.path === "/api/v1/readings")!;
    const example = op.bodyExamples!.gateway.value as { readings: { sensor: string; tempC: number }[] };
    // Now-dated copies of the example's rows: the ingest accepts only instants in its plausible window.
    const at = (minutesAgo: number) => new Date(Date.now() - minutesAgo * 60_000).toISOString();
    const readings = example.readings.map((r, i) => ({ ...r, at: at(30 + i) }));
    const response = await call(readingsRoute.POST, { method: "POST", headers: { authorization: `Bearer ${DEMO_INGEST_KEY}` }, body: { readings } });
    expect(response.status).toBe(202);
    expect(response.body.accepted).toBe(3);
  });

  it("GET /api/v1/me, GET /api/v1/me/sessions, GET /api/v1/users, GET and POST /api/v1/api-keys", async () => {
    const cookie = await sessionCookieFor(admin);
    const checks: [string, string, Awaited<ReturnType<typeof call>>][] = [
      ["get", "/api/v1/me", await call(meRoute.GET, { cookie })],
      ["get", "/api/v1/me/sessions", await call(mySessionsRoute.GET, { cookie })],
      ["get", "/api/v1/users", await call(usersRoute.GET, { cookie })],
      ["get", "/api/v1/api-keys", await call(apiKeysRoute.GET, { cookie })],
      ["post", "/api/v1/api-keys", await call(apiKeysRoute.POST, { method: "POST", cookie, body: { name: "North Campus gateway", scopes: ["readings:write"] } })],
    ];
    for (const [method, path, response] of checks) {
      expect(response.status, `${method} ${path}`).toBeLessThan(300);
      const schema = documented(method, path);
      const parsed = schema.safeParse(response.body);
      expect(parsed.success, `${method} ${path}: ${parsed.error?.message}`).toBe(true);
      expect(Object.keys(response.body).sort(), `${method} ${path}`).toEqual(keysOf(schema));
      const inner = (schema as z.ZodObject).shape.data ?? (schema as z.ZodObject).shape.user;
      const first = Array.isArray(response.body.data) ? response.body.data[0] : (response.body.data ?? response.body.user);
      const innerObject = inner instanceof z.ZodArray ? inner.element : inner;
      expect(Object.keys(first).sort(), `${method} ${path} record`).toEqual(keysOf(innerObject as z.ZodType));
    }
  });

  it("sites, rooms and storage units: lists, one record, created, changed and retired", async () => {
    const cookie = await sessionCookieFor(safety);
    const sites = await call(sitesRoute.GET, { cookie });
    expectDocumented("get", "/api/v1/sites", sites.body);
    const siteId = String(sites.body.data[0].id);
    expectDocumented("get", "/api/v1/sites/{id}", (await call(siteRoute.GET, { cookie, params: { id: siteId } })).body);
    const changedSite = await call(siteRoute.PATCH, { method: "PATCH", cookie, params: { id: siteId }, body: { address: "1 Quarry Lane, Eastmoor" } });
    expect(changedSite.status).toBe(200);
    expectDocumented("patch", "/api/v1/sites/{id}", changedSite.body);
    const newSite = await call(sitesRoute.POST, { method: "POST", cookie, body: { name: "Hollin Yard store", elevationM: 60 } });
    expect(newSite.status).toBe(201);
    expectDocumented("post", "/api/v1/sites", newSite.body);

    const rooms = await call(roomsRoute.GET, { cookie, path: "/api/v1/rooms?pageSize=100" });
    expectDocumented("get", "/api/v1/rooms", rooms.body);
    const roomId = String(rooms.body.data[0].id);
    const room = await call(roomRoute.GET, { cookie, params: { id: roomId } });
    expect(room.body.data.units.length).toBeGreaterThan(0);
    expectDocumented("get", "/api/v1/rooms/{id}", room.body);
    expectDocumented("patch", "/api/v1/rooms/{id}", (await call(roomRoute.PATCH, { method: "PATCH", cookie, params: { id: roomId }, body: { airChangesPerHour: 7 } })).body);
    const newRoom = await call(roomsRoute.POST, { method: "POST", cookie, body: { siteId: newSite.body.data.id, code: "HY-1", name: "Yard store", kind: "storeroom" } });
    expect(newRoom.status).toBe(201);
    expectDocumented("post", "/api/v1/rooms", newRoom.body);

    const units = await call(unitsRoute.GET, { cookie, path: "/api/v1/storage-units?pageSize=100" });
    expectDocumented("get", "/api/v1/storage-units", units.body);
    const unitId = String(units.body.data[0].id);
    expectDocumented("get", "/api/v1/storage-units/{id}", (await call(unitRoute.GET, { cookie, params: { id: unitId } })).body);
    expectDocumented("patch", "/api/v1/storage-units/{id}", (await call(unitRoute.PATCH, { method: "PATCH", cookie, params: { id: unitId }, body: { notes: "Checked 5 December" } })).body);
    const newUnit = await call(unitsRoute.POST, { method: "POST", cookie, body: { roomId: newRoom.body.data.id, code: "SH-9", name: "Shelf", kind: "open_shelving" } });
    expect(newUnit.status).toBe(201);
    expectDocumented("post", "/api/v1/storage-units", newUnit.body);
    const retiredUnit = await call(unitRoute.DELETE, { method: "DELETE", cookie, params: { id: String(newUnit.body.data.id) } });
    expect(retiredUnit.status).toBe(200);
    expectDocumented("delete", "/api/v1/storage-units/{id}", retiredUnit.body);
    const retiredRoom = await call(roomRoute.DELETE, { method: "DELETE", cookie, params: { id: String(newRoom.body.data.id) } });
    expect(retiredRoom.status).toBe(200);
    expectDocumented("delete", "/api/v1/rooms/{id}", retiredRoom.body);
  });

  it("containers and mixtures: one record, logged, changed, moved, state set; mixtures listed, defined, read", async () => {
    const cookie = await sessionCookieFor(safety);
    const acetone = getDb().select().from(substances).where(eq(substances.cas, "67-64-1")).get()!;
    const ethanol = getDb().select().from(substances).where(eq(substances.cas, "64-17-5")).get()!;
    const [first, second] = getDb().select().from(storageUnits).limit(2).all();
    const created = await call(containersRoute.POST, { method: "POST", cookie, body: { label: "Acetone 500 mL", substanceId: acetone.id, amount: 0.5, amountUnit: "L", storageUnitId: first.id } });
    expect(created.status).toBe(201);
    expectDocumented("post", "/api/v1/containers", created.body);
    const params = { id: String(created.body.data.id) };
    expectDocumented("get", "/api/v1/containers/{id}", (await call(containerRoute.GET, { cookie, params })).body);
    expectDocumented("patch", "/api/v1/containers/{id}", (await call(containerRoute.PATCH, { method: "PATCH", cookie, params, body: { amount: 0.4 } })).body);
    const moved = await call(containerMoveRoute.POST, { method: "POST", cookie, params, body: { storageUnitId: second.id } });
    expect(moved.body.data.moves[0].toUnitCode).toBe(second.code);
    expectDocumented("post", "/api/v1/containers/{id}/move", moved.body);
    expectDocumented("post", "/api/v1/containers/{id}/state", (await call(containerStateRoute.POST, { method: "POST", cookie, params, body: { state: "opened" } })).body);

    const mixture = await call(mixturesRoute.POST, { method: "POST", cookie, body: { name: "Acetone / ethanol 1:1", fractionBasis: "mass", components: [{ substanceId: acetone.id, fraction: 0.5 }, { substanceId: ethanol.id, fraction: 0.5 }] } });
    expect(mixture.status).toBe(201);
    expectDocumented("post", "/api/v1/mixtures", mixture.body);
    expectDocumented("get", "/api/v1/mixtures/{id}", (await call(mixtureRoute.GET, { cookie, params: { id: String(mixture.body.data.id) } })).body);
    const mixtures = await call(mixturesRoute.GET, { cookie });
    expect(mixtures.body.data.length).toBeGreaterThan(0);
    expectDocumented("get", "/api/v1/mixtures", mixtures.body);
  });

  it("sensors and excursions: listed, read, registered, changed, acknowledged", async () => {
    const cookie = await sessionCookieFor(safety);
    const sensors = await call(sensorsRoute.GET, { cookie, path: "/api/v1/sensors?pageSize=100" });
    expect(sensors.body.data.length).toBeGreaterThan(5);
    expectDocumented("get", "/api/v1/sensors", sensors.body);
    const params = { id: String(sensors.body.data[0].id) };
    expectDocumented("get", "/api/v1/sensors/{id}", (await call(sensorRoute.GET, { cookie, params })).body);
    expectDocumented("patch", "/api/v1/sensors/{id}", (await call(sensorRoute.PATCH, { method: "PATCH", cookie, params, body: { name: "B-014 ambient (wall)" } })).body);
    const unit = getDb().select().from(storageUnits).limit(1).get()!;
    const series = await call(sensorReadingsRoute.GET, { cookie, params, path: `/api/v1/sensors/${params.id}/readings` });
    expect(series.body.data.points.length).toBeGreaterThan(0);
    expectDocumented("get", "/api/v1/sensors/{id}/readings", series.body);
    const registered = await call(sensorsRoute.POST, { method: "POST", cookie, body: { externalId: "S-290", name: "Spare probe", storageUnitId: unit.id } });
    expect(registered.status).toBe(201);
    expectDocumented("post", "/api/v1/sensors", registered.body);

    const excursions = await call(excursionsRoute.GET, { cookie, path: "/api/v1/excursions" });
    expect(excursions.body.data.length).toBeGreaterThan(0);
    expectDocumented("get", "/api/v1/excursions", excursions.body);
    const waiting = excursions.body.data.find((e: { acknowledgedAt: string | null }) => e.acknowledgedAt === null);
    expect(waiting).toBeDefined();
    const acknowledged = await call(excursionAckRoute.POST, { method: "POST", cookie, params: { id: String(waiting.id) }, body: { comment: "Door closed, contents checked." } });
    expect(acknowledged.status).toBe(200);
    expectDocumented("post", "/api/v1/excursions/{id}/acknowledge", acknowledged.body);
  });

  it("substances: the library, one substance, its vapor pressure", async () => {
    const cookie = await sessionCookieFor(safety);
    const list = await call(substancesRoute.GET, { cookie, path: "/api/v1/substances?pageSize=100" });
    expect(list.body.data.length).toBeGreaterThan(20);
    expectDocumented("get", "/api/v1/substances", list.body);
    const acetone = list.body.data.find((row: { cas: string }) => row.cas === "67-64-1");
    const params = { id: String(acetone.id) };
    const one = await call(substanceRoute.GET, { cookie, params });
    expect(one.body.data.exposureLimits.length).toBeGreaterThan(0);
    expectDocumented("get", "/api/v1/substances/{id}", one.body);
    const vapor = await call(vaporRoute.GET, { cookie, params, path: `/api/v1/substances/${acetone.id}/vapor-pressure?tempC=20` });
    expect(vapor.status).toBe(200);
    expectDocumented("get", "/api/v1/substances/{id}/vapor-pressure", vapor.body);
  });

  it("findings: one finding with its events, a step taken; the settings read and stored; the audit log", async () => {
    const cookie = await sessionCookieFor(safety);
    const list = await call(findingsRoute.GET, { cookie, path: "/api/v1/findings?status=open" });
    const params = { id: String(list.body.data[0].id) };
    expectDocumented("get", "/api/v1/findings/{id}", (await call(findingRoute.GET, { cookie, params })).body);
    const step = await call(findingEventsRoute.POST, { method: "POST", cookie, params, body: { kind: "acknowledge", note: "Seen." } });
    expect(step.status).toBe(201);
    expect(step.body.data.status).toBe("acknowledged");
    expectDocumented("post", "/api/v1/findings/{id}/events", step.body);

    const settings = await call(settingsRoute.GET, { cookie });
    expectDocumented("get", "/api/v1/settings/assessment", settings.body);
    const saved = await call(settingsRoute.PUT, { method: "PUT", cookie, body: settings.body.data });
    expect(saved.status).toBe(202);
    expectDocumented("put", "/api/v1/settings/assessment", saved.body);

    const audit = await call(auditRoute.GET, { cookie, path: "/api/v1/audit-events?pageSize=50" });
    expect(audit.body.data.length).toBeGreaterThan(0);
    expectDocumented("get", "/api/v1/audit-events", audit.body);
  });

  it("uploads: a safety data sheet, container and location files checked and imported; a unit's warm-up", async () => {
    const cookie = await sessionCookieFor(safety);
    const send = async (handler: (request: Request, context: { params: Promise<Record<string, string>> }) => Promise<Response>, name: string, content: string, params: Record<string, string> = {}, type = "text/csv") => {
      const form = new FormData();
      form.set("file", new File([content], name, { type }));
      const response = await handler(new Request("http://localhost:3999/api/v1/upload", { method: "POST", headers: { cookie }, body: form }), { params: Promise.resolve(params) });
      return { status: response.status, body: await response.json() };
    };
    const pdf = "%PDF-1.4\n1 0 obj << /Type /Catalog /Pages 2 0 R >> endobj\n2 0 obj << /Type /Pages /Kids [3 0 R] /Count 1 >> endobj\n3 0 obj << /Type /Page /Parent 2 0 R /MediaBox [0 0 595 842] >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n";
    const containers = await call(containersRoute.GET, { cookie });
    const sds = await send(containerSdsRoute.POST, "acetone-sds.pdf", pdf, { id: String(containers.body.data[0].id) }, "application/pdf");
    expect(sds.status).toBe(201);
    expectDocumented("post", "/api/v1/containers/{id}/sds", sds.body);

    const csv = "label,cas,substance,amount,amount_unit,site,room,storage_unit,owner_email\nImported acetone 1,67-64-1,,1.5,L,North Campus,B-014,FC-1,researcher@example.org\n";
    const preview = await send(containerImportPreviewRoute.POST, "containers.csv", csv);
    expect(preview.status).toBe(200);
    expect(preview.body.data.toCreate).toBe(1);
    expectDocumented("post", "/api/v1/imports/containers/preview", preview.body);
    const imported = await send(containerImportRoute.POST, "containers.csv", csv);
    expect(imported.status).toBe(201);
    expect(imported.body.data.created).toBe(1);
    expectDocumented("post", "/api/v1/imports/containers", imported.body);
    const locations = await send(locationImportPreviewRoute.POST, "locations.csv", locationTemplateCsv());
    expect(locations.status).toBe(200);
    expectDocumented("post", "/api/v1/imports/locations/preview", locations.body);

    const fsr = getDb().select().from(storageUnits).where(eq(storageUnits.code, "FSR-1")).get()!;
    const warmUp = await call(warmUpRoute.GET, { cookie, params: { id: String(fsr.id) } });
    expect(warmUp.status).toBe(200);
    expectDocumented("get", "/api/v1/storage-units/{id}/warm-up", warmUp.body);
  });

  it("a logger file: uploaded, previewed, imported", async () => {
    const cookie = await sessionCookieFor(safety);
    const sensor = getDb().select().from(sensors).where(eq(sensors.externalId, "S-202")).get()!;
    // Seven minutes past the hour: between the demo logger's own readings.
    const stamp = (hoursAgo: number) => new Date(Math.floor(Date.now() / 3_600_000) * 3_600_000 - hoursAgo * 3_600_000 + 7 * 60_000).toISOString().slice(0, 16).replace("T", " ");
    const csv = `Time,Temp\n${stamp(3)},21.2\n${stamp(2)},21.4\n`;
    const form = new FormData();
    form.set("file", new File([csv], "s-202.csv", { type: "text/csv" }));
    const params = { id: String(sensor.id) };
    const uploaded = await csvUploadsRoute.POST(new Request("http://localhost:3999/api/v1/sensors/x/csv-uploads", { method: "POST", headers: { cookie }, body: form }), { params: Promise.resolve(params) });
    expect(uploaded.status).toBe(201);
    const upload = await uploaded.json();
    expectDocumented("post", "/api/v1/sensors/{id}/csv-uploads", upload);
    const mapping = { delimiter: ",", decimalSeparator: ".", headerLine: 1, timestampColumn: "Time", temperatureColumn: "Temp", unit: "C", dateOrder: "ymd", timeZone: "UTC" };
    const withToken = { ...params, token: upload.data.token };
    const preview = await call(csvPreviewRoute.POST, { method: "POST", cookie, params: withToken, body: mapping });
    expect(preview.status).toBe(200);
    expect(preview.body.data.issues, JSON.stringify(preview.body.data.issues)).toEqual([]);
    expect(preview.body.data.readingCount).toBe(2);
    expectDocumented("post", "/api/v1/sensors/{id}/csv-uploads/{token}/preview", preview.body);
    const imported = await call(csvImportRoute.POST, { method: "POST", cookie, params: withToken, body: mapping });
    expect(imported.status).toBe(200);
    expect(imported.body.data.accepted).toBe(2);
    expectDocumented("post", "/api/v1/sensors/{id}/csv-uploads/{token}/import", imported.body);
  });

  it("a 400 with field errors is in the shared error shape", async () => {
    const response = await call(containersRoute.POST, { method: "POST", cookie: await sessionCookieFor(safety), body: { label: "" } });
    expect(response.status).toBe(400);
    const parsed = errorSchema.safeParse(response.body);
    expect(parsed.success).toBe(true);
    expect(response.body.error.code).toBe("invalid_input");
    expect(Object.keys(response.body.error.fields)).toEqual(expect.arrayContaining(["amount", "storageUnitId"]));
  });
});
