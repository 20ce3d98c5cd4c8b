/**
 * Readings a hostile or broken logger sends: instants that do not exist or lie outside the window,
 * temperatures no sensor reads, two temperatures for one instant, a reading that contradicts a
 * stored one — through the logger API and through logger-file uploads — and a logger file made of
 * one 100 MB line.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { readings, rooms, sensors, sites, storageUnits, type User } from "@/db/schema";
import * as readingsRoute from "@/app/api/v1/readings/route";
import * as uploadRoute from "@/app/api/v1/sensors/[id]/csv-uploads/route";
import * as previewRoute from "@/app/api/v1/sensors/[id]/csv-uploads/[token]/preview/route";
import * as importRoute from "@/app/api/v1/sensors/[id]/csv-uploads/[token]/import/route";
import { createApiKey } from "@/lib/api-keys/service";
import { LOGGER_CSV_LIMITS } from "@/lib/limits";
import { call, makeUser, sessionCookieFor } from "../helpers/world";

process.env.UPLOAD_DIR = fs.mkdtempSync(path.join(os.tmpdir(), "headroom-plausibility-"));

let key: string;
let cookie: string;
let facilities: User;
let sensorId: number;
let otherSensorId: number;

beforeAll(async () => {
  const db = getDb();
  const admin = makeUser("admin");
  facilities = makeUser("facilities");
  cookie = await sessionCookieFor(facilities);
  const site = db.insert(sites).values({ name: "Test campus" }).returning().get();
  const room = db.insert(rooms).values({ siteId: site.id, code: "P-1", name: "Prep lab", designMaxTempC: 27 }).returning().get();
  const unit = db.insert(storageUnits).values({ roomId: room.id, code: "FR-P", name: "Prep refrigerator", kind: "flammable_storage_refrigerator", setMinC: 2, setMaxC: 8 }).returning().get();
  sensorId = db.insert(sensors).values({ externalId: "LOG-P1", name: "Prep fridge logger", storageUnitId: unit.id }).returning().get().id;
  otherSensorId = db.insert(sensors).values({ externalId: "LOG-P2", name: "Prep room logger", roomId: room.id }).returning().get().id;
  key = createApiKey({ id: admin.id, email: admin.email, name: admin.name, role: "admin" }, { name: "Gateway", scopes: ["readings:write"] }).key;
});

async function ingest(list: unknown[]) {
  const response = await readingsRoute.POST(
    new Request("http://localhost/api/v1/readings", { method: "POST", headers: { authorization: `Bearer ${key}`, "content-type": "application/json" }, body: JSON.stringify({ readings: list }) }),
  );
  return { status: response.status, body: await response.json() };
}

async function ingestRaw(json: string) {
  const response = await readingsRoute.POST(new Request("http://localhost/api/v1/readings", { method: "POST", headers: { authorization: `Bearer ${key}`, "content-type": "application/json" }, body: json }));
  return { status: response.status, body: await response.json() };
}

const stored = (id = sensorId) => getDb().select().from(readings).where(eq(readings.sensorId, id)).all();
const iso = (ms: number) => new Date(ms).toISOString();

describe("POST /api/v1/readings refuses implausible readings, and stores nothing of their batch", () => {
  it("refuses 9999-12-31, 1970, 0001, 2026-02-30, 24:00, month 13, an offset beyond ±14:00 and 6 minutes ahead, each with its reason", async () => {
    const good = { sensor: "LOG-P1", at: "2026-11-30T10:00:00Z", tempC: 4.2 };
    const sixMinutesAhead = iso(Date.now() + 6 * 60_000);
    const response = await ingest([
      good,
      { sensor: "LOG-P1", at: "9999-12-31T23:59:59Z", tempC: 4.2 },
      { sensor: "LOG-P1", at: "1970-01-01T00:00:00Z", tempC: 4.2 },
      { sensor: "LOG-P1", at: "0001-01-01T00:00:00Z", tempC: 4.2 },
      { sensor: "LOG-P1", at: "2026-02-30T10:00:00Z", tempC: 4.2 },
      { sensor: "LOG-P1", at: "2026-07-14T24:00:00Z", tempC: 4.2 },
      { sensor: "LOG-P1", at: "2026-13-01T10:00:00Z", tempC: 4.2 },
      { sensor: "LOG-P1", at: "2026-07-14T10:00:00+15:00", tempC: 4.2 },
      { sensor: "LOG-P1", at: sixMinutesAhead, tempC: 4.2 },
    ]);
    expect(response.status).toBe(400);
    expect(response.body.error.code).toBe("batch_rejected");
    expect(response.body.error.message).toBe("Nothing was stored: 8 problems in the batch. Fix them and send the whole batch again.");
    const rows = response.body.error.rows as { index: number; field: string; message: string }[];
    expect(rows.map((r) => `${r.index}:${r.field}`)).toEqual(["1:at", "2:at", "3:at", "4:at", "5:at", "6:at", "7:at", "8:at"]);
    expect(rows[0].message).toMatch(/^at is 9999-12-31T23:59:59Z, more than 5 minutes after the server's time \(/);
    expect(rows[1].message).toBe("at is 1970-01-01T00:00:00Z, before 2000-01-01T00:00:00Z, the earliest reading Headroom stores: is the logger's clock set?");
    expect(rows[2].message).toBe("at is 0001-01-01T00:00:00Z, before 2000-01-01T00:00:00Z, the earliest reading Headroom stores: is the logger's clock set?");
    expect(rows[3].message).toBe("at is not a real date: 2026-02 has no day 30.");
    expect(rows[4].message).toBe("at is not a real time of day: 24:00:00 (hours run 00–23, minutes and seconds 00–59).");
    expect(rows[5].message).toBe("at is not a real date: month 13 does not exist.");
    expect(rows[6].message).toBe("at has the offset +15:00, beyond ±14:00: no place on Earth uses it.");
    expect(rows[7].message).toMatch(new RegExp(`^at is ${sixMinutesAhead.replace(".000Z", "Z").replace(/[.]/g, "\\.")}, more than 5 minutes after`));
    expect(stored()).toEqual([]);
  });

  it("accepts an instant 4 minutes ahead (a logger's clock drifts) and 2000-01-01 exactly", async () => {
    const ahead = new Date(Math.floor((Date.now() + 4 * 60_000) / 1000) * 1000).toISOString();
    const response = await ingest([
      { sensor: "LOG-P2", at: ahead, tempC: 21 },
      { sensor: "LOG-P2", at: "2000-01-01T00:00:00Z", tempC: 20 },
    ]);
    expect(response).toEqual({ status: 202, body: { accepted: 2, duplicates: 0, conflicts: 0, conflictRows: [] } });
    expect(stored(otherSensorId).map((r) => r.at.toISOString()).sort()).toEqual(["2000-01-01T00:00:00.000Z", ahead]);
  });

  it("refuses −273 °C, 250 °C and NaN-like values, and a temperature 1e999 that JSON reads as infinity", async () => {
    const at = "2026-11-30T11:00:00Z";
    const response = await ingest([
      { sensor: "LOG-P1", at, tempC: -273 },
      { sensor: "LOG-P1", at, tempC: 250 },
      { sensor: "LOG-P1", at, tempC: "NaN" },
      { sensor: "LOG-P1", at, tempC: "Infinity" },
      { sensor: "LOG-P1", at, tempC: "4.5" },
      { sensor: "LOG-P1", at, tempC: null },
    ]);
    expect(response.status).toBe(400);
    expect(response.body.error.rows).toEqual([
      { index: 0, field: "tempC", message: "tempC is -273 °C, outside −200 to 200 °C: an error value of the logger, or the wrong unit?" },
      { index: 1, field: "tempC", message: "tempC is 250 °C, outside −200 to 200 °C: an error value of the logger, or the wrong unit?" },
      { index: 2, field: "tempC", message: "tempC must be a number, in °C." },
      { index: 3, field: "tempC", message: "tempC must be a number, in °C." },
      { index: 4, field: "tempC", message: "tempC must be a number, in °C." },
      { index: 5, field: "tempC", message: "tempC must be a number, in °C." },
    ]);
    const infinite = await ingestRaw(`{"readings":[{"sensor":"LOG-P1","at":"${at}","tempC":1e999}]}`);
    expect(infinite.status).toBe(400);
    expect(infinite.body.error.rows).toHaveLength(1);
    expect(infinite.body.error.rows[0]).toMatchObject({ index: 0, field: "tempC" });
    expect(stored()).toEqual([]);
  });

  it("refuses two different temperatures for one sensor and instant, naming each other's index; the same reading twice is a duplicate", async () => {
    const response = await ingest([
      { sensor: "LOG-P1", at: "2026-11-30T12:00:00Z", tempC: 4.4 },
      { sensor: "LOG-P1", at: "2026-11-30T13:00:00+01:00", tempC: 4.9 },
      { sensor: "LOG-P2", at: "2026-11-30T12:00:00Z", tempC: 19 }, // another sensor: no clash
    ]);
    expect(response.status).toBe(400);
    expect(response.body.error.rows).toEqual([
      { index: 0, field: "tempC", message: "The reading at index 1 gives sensor “LOG-P1” 4.9 °C at the same instant (2026-11-30T12:00:00Z); this one says 4.4 °C. Keep one of them." },
      { index: 1, field: "tempC", message: "The reading at index 0 gives sensor “LOG-P1” 4.4 °C at the same instant (2026-11-30T12:00:00Z); this one says 4.9 °C. Keep one of them." },
    ]);
    expect(stored()).toEqual([]);

    const same = await ingest([
      { sensor: "LOG-P1", at: "2026-11-30T12:00:00Z", tempC: 4.4 },
      { sensor: "LOG-P1", at: "2026-11-30T13:00:00+01:00", tempC: 4.4 },
    ]);
    expect(same).toEqual({ status: 202, body: { accepted: 1, duplicates: 1, conflicts: 0, conflictRows: [] } });
  });

  it("reports a reading that differs from the stored one as a conflict, keeps the stored value and stores the rest", async () => {
    const response = await ingest([
      { sensor: "LOG-P1", at: "2026-11-30T13:00:00+01:00", tempC: 7.5 },
      { sensor: "LOG-P1", at: "2026-11-30T12:05:00Z", tempC: 4.5 },
      { sensor: "LOG-P1", at: "2026-11-30T12:05:00.000Z", tempC: 4.5 },
    ]);
    expect(response).toEqual({
      status: 202,
      body: { accepted: 1, duplicates: 1, conflicts: 1, conflictRows: [{ index: 0, sensor: "LOG-P1", at: "2026-11-30T13:00:00+01:00", tempC: 7.5, storedTempC: 4.4 }] },
    });
    const at12 = getDb().select().from(readings).where(and(eq(readings.sensorId, sensorId), eq(readings.at, new Date("2026-11-30T12:00:00Z")))).get()!;
    expect(at12.tempC).toBe(4.4);
    expect(stored().map((r) => [r.at.toISOString(), r.tempC])).toEqual([
      ["2026-11-30T12:00:00.000Z", 4.4],
      ["2026-11-30T12:05:00.000Z", 4.5],
    ]);
  });
});

// ---------------------------------------------------------------------------------------------

type Handler = (request: Request, context: { params: Promise<Record<string, string>> }) => Promise<Response>;

async function upload(id: number, content: BlobPart) {
  const form = new FormData();
  form.set("file", new File([content], "logger.csv", { type: "text/csv" }));
  const request = new Request(`http://localhost:3999/api/v1/sensors/${id}/csv-uploads`, { method: "POST", headers: { cookie }, body: form });
  const response = await (uploadRoute.POST as Handler)(request, { params: Promise.resolve({ id: String(id) }) });
  return { status: response.status, body: await response.json() };
}

const mapping = { delimiter: ",", decimalSeparator: ".", headerLine: 1, timestampColumn: "Time", temperatureColumn: "Temp", unit: "C", dateOrder: "ymd", timeZone: "UTC" };

function step(handler: Handler, id: number, token: string) {
  const kind = handler === previewRoute.POST ? "preview" : "import";
  return call(handler, { method: "POST", path: `/api/v1/sensors/${id}/csv-uploads/${token}/${kind}`, body: mapping, cookie, params: { id: String(id), token } });
}

describe("logger-file uploads apply the same rules", () => {
  it("lists every implausible row by line and column in the preview, and the import stores nothing", async () => {
    const sixAhead = new Date(Date.now() + 6 * 60_000).toISOString().slice(0, 16).replace("T", " ");
    const text = [
      "Time,Temp",
      "2026-11-30 14:00,4.6",
      "9999-12-31 23:59,4.6",
      "1970-01-01 00:00,4.6",
      "0001-01-01 00:00,4.6",
      "2026-02-30 10:00,4.6",
      `${sixAhead},4.6`,
      "2026-11-30 14:05,-273",
      "2026-11-30 14:10,250",
      "2026-11-30 14:15,NaN",
      "2026-11-30 14:20,4.7",
    ].join("\n");
    const uploaded = await upload(sensorId, text);
    expect(uploaded.status).toBe(201);
    const { token } = uploaded.body.data;
    const preview = await step(previewRoute.POST, sensorId, token);
    expect(preview.status).toBe(200);
    expect(preview.body.data).toMatchObject({ rowCount: 10, readingCount: 2, issueCount: 8, issueLineCount: 8 });
    const issues = preview.body.data.issues as { line: number; column: string; value: string; message: string }[];
    expect(issues.map((i) => `${i.line}:${i.column}`)).toEqual(["3:Time", "4:Time", "5:Time", "6:Time", "7:Time", "8:Temp", "9:Temp", "10:Temp"]);
    expect(issues[0].message).toMatch(/^“9999-12-31 23:59” is 9999-12-31T23:59:00Z, more than 5 minutes after the server's time/);
    expect(issues[1].message).toBe("“1970-01-01 00:00” is 1970-01-01T00:00:00Z, before 2000-01-01T00:00:00Z, the earliest reading Headroom stores: is the logger's clock set?");
    expect(issues[2].message).toBe("“0001-01-01 00:00” is 0001-01-01T00:00:00Z, before 2000-01-01T00:00:00Z, the earliest reading Headroom stores: is the logger's clock set?");
    expect(issues[3].message).toBe("“2026-02-30 10:00” is not a date: 2026-02 has no day 30.");
    expect(issues[4].message).toMatch(/more than 5 minutes after the server's time/);
    expect(issues[5].message).toBe("-273 °C is outside −200 to 200 °C: an error value of the logger, or the wrong unit?");
    expect(issues[6].message).toBe("250 °C is outside −200 to 200 °C: an error value of the logger, or the wrong unit?");
    expect(issues[7].message).toBe("“NaN” is not a number.");
    const before = stored().length;
    const imported = await step(importRoute.POST, sensorId, token);
    expect(imported.status).toBe(400);
    expect(imported.body.error).toMatchObject({ code: "import_rejected", issueCount: 8 });
    expect(stored()).toHaveLength(before);
  });

  it("lists a row whose instant holds a different stored temperature as a conflict, and the import keeps the stored one", async () => {
    // Stored by the API above: 12:00Z 4.4 °C and 12:05Z 4.5 °C.
    const text = "Time,Temp\n2026-11-30 12:00,4.4\n2026-11-30 12:05,6.5\n2026-11-30 12:10,4.6\n";
    const { token } = (await upload(sensorId, text)).body.data;
    const preview = await step(previewRoute.POST, sensorId, token);
    expect(preview.status).toBe(200);
    expect(preview.body.data).toMatchObject({ readingCount: 3, issueCount: 0, alreadyStored: 2, conflicts: 1 });
    expect(preview.body.data.conflictRows).toEqual([{ line: 3, atMs: Date.parse("2026-11-30T12:05:00Z"), tempC: 6.5, storedTempC: 4.5 }]);
    const imported = await step(importRoute.POST, sensorId, token);
    expect(imported.status).toBe(200);
    expect(imported.body.data).toMatchObject({ accepted: 1, duplicates: 2, alreadyStored: 2, conflicts: 1 });
    const at1205 = getDb().select().from(readings).where(and(eq(readings.sensorId, sensorId), eq(readings.at, new Date("2026-11-30T12:05:00Z")))).get()!;
    expect(at1205.tempC).toBe(4.5);
  });
});

describe("logger-file rows are bounded while the file is read", () => {
  it("refuses a 100 MB file of one line at the upload, quickly, naming line 1", async () => {
    const size = LOGGER_CSV_LIMITS.maxUploadBytes - 64 * 1024;
    const oneLine = new Uint8Array(size).fill(0x31); // "1" × 100 MB, no line break
    const uploadsBefore = fs.readdirSync(path.join(process.env.UPLOAD_DIR!, "csv-uploads")).sort();
    const startedAt = performance.now();
    const response = await upload(sensorId, oneLine);
    const seconds = (performance.now() - startedAt) / 1000;
    expect(response.status).toBe(400);
    expect(response.body.error.code).toBe("invalid_input");
    expect(response.body.error.message).toBe(
      "The file cannot be read. Line 1: the row runs on for more than 32,768 characters, the most one row of a logger file may have. A double quote that is never closed, or a file without line breaks, is the usual cause.",
    );
    expect(response.body.error.fields.file[0]).toMatch(/^Line 1: the row runs on for more than 32,768 characters/);
    // Streaming 100 MB to disk is the cost; the file is then refused from its first 64 KB.
    expect(seconds).toBeLessThan(15);
    console.log(`100 MB one-line upload refused in ${seconds.toFixed(2)} s`);
    expect(fs.readdirSync(path.join(process.env.UPLOAD_DIR!, "csv-uploads")).sort()).toEqual(uploadsBefore); // not kept
  }, 60_000);

  it("refuses a long row further down at the preview (400 naming its line), and a row with too many columns", async () => {
    const rows = ["Time,Temp"];
    for (let i = 0; i < 4000; i++) rows.push(`2026-11-29 ${String(Math.floor(i / 60) % 24).padStart(2, "0")}:${String(i % 60).padStart(2, "0")},5.0`);
    rows.push(`2026-11-30 01:00,"${"x".repeat(40_000)}"`);
    const { token } = (await upload(otherSensorId, rows.join("\n") + "\n")).body.data;
    const preview = await step(previewRoute.POST, otherSensorId, token);
    expect(preview.status).toBe(400);
    expect(preview.body.error.message).toMatch(/^The file cannot be read\. Line 4002: the row runs on for more than 32,768 characters/);

    const wide = `Time,Temp\n2026-11-30 02:00,5.0${",".repeat(1000)}\n`;
    const wideUpload = await upload(otherSensorId, wide);
    expect(wideUpload.status).toBe(400);
    expect(wideUpload.body.error.message).toBe("The file cannot be read. Line 2: the row has more than 1,000 columns, the most a logger file may have. Is the delimiter the right one?");
  });
});
