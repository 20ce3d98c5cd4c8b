/**
 * Logger-file (CSV) uploads through the route handlers: upload → preview → import, all or
 * nothing, duplicates, °F, time zones, the remembered mapping, excursions, limits and roles.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { auditEvents, excursions, readings, rooms, sensors, sites, storageUnits, type Role, type User } from "@/db/schema";
import * as uploadRoute from "@/app/api/v1/sensors/[id]/csv-uploads/route";
import * as previewRoute from "@/app/api/v1/sensors/[id]/csv-uploads/[token]/preview/route";
import * as importRoute from "@/app/api/v1/sensors/[id]/csv-uploads/[token]/import/route";
import { CSV_UPLOAD_TTL_MS, MAX_CSV_UPLOAD_BYTES } from "@/lib/temperatures/csv-upload";
import { call, makeUser, sessionCookieFor } from "./helpers/world";

// uploadDir() reads the variable when it is called, so setting it here is enough.
const uploadDir = fs.mkdtempSync(path.join(os.tmpdir(), "headroom-csv-uploads-"));
process.env.UPLOAD_DIR = uploadDir;
const csvDir = path.join(uploadDir, "csv-uploads");
// One person uploads, previews and imports dozens of files here within a minute; the per-person
// limit on imports is tested in security/rate-limits.test.ts.
process.env.RATE_LIMIT_IMPORT_USER = "10000";

const MIN = 60_000;
const cookies = {} as Record<Role, string>;
const people = {} as Record<Role, User>;
let unitId: number;
let sensorIds: Record<"fridge" | "us" | "memo" | "excursion", number>;

beforeAll(async () => {
  const db = getDb();
  for (const role of ["admin", "safety_officer", "facilities", "researcher", "auditor"] as const) {
    people[role] = makeUser(role);
    cookies[role] = await sessionCookieFor(people[role]);
  }
  const site = db.insert(sites).values({ name: "Test campus" }).returning().get();
  const room = db.insert(rooms).values({ siteId: site.id, code: "C-1", name: "Cold lab", designMaxTempC: 27 }).returning().get();
  unitId = db
    .insert(storageUnits)
    .values({ roomId: room.id, code: "FR-C", name: "Cold-lab refrigerator", kind: "flammable_storage_refrigerator", setMinC: 2, setMaxC: 8, excursionThresholdC: 8, excursionMinDurationMin: 30 })
    .returning()
    .get().id;
  const add = (externalId: string) => db.insert(sensors).values({ externalId, name: `Logger ${externalId}`, storageUnitId: unitId }).returning().get().id;
  sensorIds = { fridge: add("LOG-C1"), us: add("LOG-US"), memo: add("LOG-MEMO"), excursion: add("LOG-EXC") };
});

type Handler = (request: Request, context: { params: Promise<Record<string, string>> }) => Promise<Response>;

async function upload(sensorId: number, text: string | Uint8Array, options: { cookie?: string; name?: string } = {}) {
  const form = new FormData();
  form.set("file", new File([text as BlobPart], options.name ?? "logger-export.csv", { type: "text/csv" }));
  const request = new Request(`http://localhost:3999/api/v1/sensors/${sensorId}/csv-uploads`, {
    method: "POST",
    headers: options.cookie === "" ? {} : { cookie: options.cookie ?? cookies.facilities },
    body: form,
  });
  const response = await (uploadRoute.POST as Handler)(request, { params: Promise.resolve({ id: String(sensorId) }) });
  return { status: response.status, body: await response.json() };
}

function step(handler: Handler, sensorId: number, token: string, mapping: unknown, cookie = cookies.facilities) {
  const kind = handler === previewRoute.POST ? "preview" : "import";
  return call(handler, { method: "POST", path: `/api/v1/sensors/${sensorId}/csv-uploads/${token}/${kind}`, body: mapping, cookie, params: { id: String(sensorId), token } });
}

const berlinMapping = { delimiter: ",", decimalSeparator: ".", headerLine: 1, timestampColumn: "Timestamp", temperatureColumn: "Temperature", unit: "C", deviceIdColumn: "Device", dateOrder: "ymd", timeZone: "Europe/Berlin" };

/** `count` readings every 30 s from 2026-07-01 00:00 Berlin time (22:00Z the day before), 4.0–5.9 °C. */
function berlinFile(count: number, edit?: (line: number, row: string) => string): string {
  const rows = ["Timestamp,Temperature,Device"];
  const start = Date.UTC(2026, 6, 1, 0, 0, 0); // the wall time
  for (let i = 0; i < count; i++) {
    const wall = new Date(start + i * 30_000).toISOString().slice(0, 19).replace("T", " ");
    const row = `${wall},${(4 + (i % 20) / 10).toFixed(1)},LOG-C1`;
    rows.push(edit ? edit(i + 2, row) : row);
  }
  return rows.join("\r\n") + "\r\n";
}

const storedFor = (sensorId: number) => getDb().$count(readings, eq(readings.sensorId, sensorId));
const auditFor = (sensorId: number) =>
  getDb().select().from(auditEvents).where(and(eq(auditEvents.entityType, "sensor"), eq(auditEvents.entityId, String(sensorId)), eq(auditEvents.action, "upload_readings"))).all();

describe("a logger file with one bad line among thousands", () => {
  it("is previewed with that line and column, and its import writes nothing", async () => {
    const text = berlinFile(6000, (line, row) => (line === 4321 ? row.replace(/,[\d.]+,/, ",4.5°,") : row));
    const uploaded = await upload(sensorIds.fridge, text);
    expect(uploaded.status).toBe(201);
    const { token, layout, mapping } = uploaded.body.data;
    expect(token).toMatch(/^[0-9a-f]{32}$/);
    expect(layout).toMatchObject({ delimiter: ",", decimalSeparator: ".", headerLine: 1, headers: ["Timestamp", "Temperature", "Device"] });
    expect(mapping).toMatchObject({ timestampColumn: "Timestamp", temperatureColumn: "Temperature", deviceIdColumn: "Device", dateOrder: "ymd" });

    const preview = await step(previewRoute.POST, sensorIds.fridge, token, berlinMapping);
    expect(preview.status).toBe(200);
    expect(preview.body.data).toMatchObject({ rowCount: 6000, readingCount: 5999, issueCount: 1, issueLineCount: 1, alreadyStored: 0 });
    expect(preview.body.data.issues).toEqual([{ line: 4321, column: "Temperature", value: "4.5°", message: "“4.5°” is not a number." }]);
    expect(preview.body.data.rows).toHaveLength(20);
    expect(preview.body.data.rows[0]).toEqual({ line: 2, atMs: Date.parse("2026-06-30T22:00:00Z"), tempC: 4, timeText: "2026-07-01 00:00:00", temperatureText: "4.0" });

    const imported = await step(importRoute.POST, sensorIds.fridge, token, berlinMapping);
    expect(imported.status).toBe(400);
    expect(imported.body.error).toMatchObject({ code: "import_rejected", issueCount: 1, issueLineCount: 1, rowCount: 6000 });
    expect(imported.body.error.message).toBe("Nothing was imported: 1 problem on 1 row of 6,000. Fix them in the file (or the column choices) and import again.");
    expect(imported.body.error.issues).toEqual([{ line: 4321, column: "Temperature", value: "4.5°", message: "“4.5°” is not a number." }]);
    expect(await storedFor(sensorIds.fridge)).toBe(0);
    expect(auditFor(sensorIds.fridge)).toHaveLength(0);
    const sensor = getDb().select().from(sensors).where(eq(sensors.id, sensorIds.fridge)).get()!;
    expect(sensor.csvMapping).toBeNull();
  });

  it("lists the first 500 problems and counts them all", async () => {
    const text = berlinFile(2000, (line, row) => (line % 2 === 0 ? row.replace("LOG-C1", "LOG-ZZ") : row));
    const { token } = (await upload(sensorIds.fridge, text)).body.data;
    const preview = await step(previewRoute.POST, sensorIds.fridge, token, berlinMapping);
    expect(preview.body.data).toMatchObject({ issueCount: 1000, issueLineCount: 1000 });
    expect(preview.body.data.issues).toHaveLength(500);
    expect(preview.body.data.issues[0]).toEqual({ line: 2, column: "Device", value: "LOG-ZZ", message: "Device id “LOG-ZZ” is not this sensor's (“LOG-C1”): the row comes from another logger." });
    expect(preview.body.data.issues[499].line).toBe(1000);
  });
});

describe("a good logger file", () => {
  let firstToken: string;

  it("is stored whole, converted to UTC, audited, with the upload deleted afterwards", async () => {
    const uploaded = await upload(sensorIds.fridge, berlinFile(12_345), { name: "fridge-july.csv" });
    firstToken = uploaded.body.data.token;
    const imported = await step(importRoute.POST, sensorIds.fridge, firstToken, berlinMapping);
    expect(imported.status).toBe(200);
    expect(imported.body.data).toMatchObject({
      accepted: 12_345,
      duplicates: 0,
      rowCount: 12_345,
      firstAtMs: Date.parse("2026-06-30T22:00:00Z"), // 00:00 in Berlin is UTC+02:00 in July
      lastAtMs: Date.parse("2026-06-30T22:00:00Z") + 12_344 * 30_000,
      excursions: { opened: 0, closed: 0, updated: 0 },
    });
    expect(await storedFor(sensorIds.fridge)).toBe(12_345);
    const [event] = auditFor(sensorIds.fridge);
    expect(event.summary).toBe("Uploaded 12,345 readings from fridge-july.csv (no duplicates)");
    expect(event.actorId).toBe(people.facilities.id);
    expect(fs.readdirSync(csvDir).filter((n) => n.startsWith(firstToken))).toEqual([]);
    const again = await step(importRoute.POST, sensorIds.fridge, firstToken, berlinMapping);
    expect(again.status).toBe(404);
    expect(again.body.error.code).toBe("upload_not_found");
  });

  it("uploaded again stores nothing new and counts every row as a duplicate", async () => {
    const { token } = (await upload(sensorIds.fridge, berlinFile(12_345), { name: "fridge-july.csv" })).body.data;
    const preview = await step(previewRoute.POST, sensorIds.fridge, token, berlinMapping);
    expect(preview.body.data).toMatchObject({ readingCount: 12_345, alreadyStored: 12_345, conflicts: 0, conflictRows: [] });
    const imported = await step(importRoute.POST, sensorIds.fridge, token, berlinMapping);
    expect(imported.body.data).toMatchObject({ accepted: 0, duplicates: 12_345, alreadyStored: 12_345 });
    expect(await storedFor(sensorIds.fridge)).toBe(12_345);
    expect(auditFor(sensorIds.fridge).map((e) => e.summary)).toContain("Uploaded 0 readings from fridge-july.csv (12,345 duplicates not stored again)");
  });

  it("with a row repeated (same instant, same value) stores it once, and with a different value refuses the later line", async () => {
    const repeated = "Timestamp,Temperature\n2026-08-01T10:00:00Z,5.0\n2026-08-01T10:00:00Z,5.0\n2026-08-01T10:00:30Z,5.1\n";
    const mapping = { ...berlinMapping, deviceIdColumn: undefined };
    const ok = await step(importRoute.POST, sensorIds.fridge, (await upload(sensorIds.fridge, repeated)).body.data.token, mapping);
    expect(ok.body.data).toMatchObject({ accepted: 2, duplicates: 1, repeatedInFile: 1 });
    const conflicting = "Timestamp,Temperature\n2026-08-02T10:00:00Z,5.0\n2026-08-02T12:00:00+02:00,5.4\n";
    const refused = await step(importRoute.POST, sensorIds.fridge, (await upload(sensorIds.fridge, conflicting)).body.data.token, mapping);
    expect(refused.status).toBe(400);
    expect(refused.body.error.issues).toEqual([
      { line: 3, column: "Timestamp", value: "2026-08-02T12:00:00+02:00", message: "Line 2 has the same instant (2026-08-02T10:00:00Z) with 5 °C; this line says 5.4 °C. Keep one of the two." },
    ]);
  });
});

describe("units and time zones", () => {
  it("stores a °F file in °C (46.4 °F = 8 °C; NIST SP 811 B.9) and converts New York local time, DST included, to UTC", async () => {
    // Semicolons, decimal commas, month-first dates, 12-hour clock, an information block; across
    // the change of 8 March 2026 (02:00 EST → 03:00 EDT, 15 U.S.C. §260a).
    const text = [
      "Logger;LOG-US",
      "Units;Fahrenheit",
      "Date;Time;Temp (°F);Serial",
      "03/07/2026;11:30:00 PM;46,4;LOG-US",
      "03/08/2026;1:59:00 AM;41;LOG-US",
      "03/08/2026;3:00:00 AM;39,2;LOG-US",
      "07/14/2026;3:40:00 PM;35,6;LOG-US",
    ].join("\n");
    const uploaded = await upload(sensorIds.us, text);
    expect(uploaded.body.data.layout).toMatchObject({ delimiter: ";", decimalSeparator: ",", headerLine: 3 });
    expect(uploaded.body.data.mapping).toMatchObject({ dateColumn: "Date", timeColumn: "Time", temperatureColumn: "Temp (°F)", unit: "F", deviceIdColumn: "Serial", dateOrder: "mdy" });
    const mapping = { ...uploaded.body.data.mapping, timeZone: "America/New_York" };
    const imported = await step(importRoute.POST, sensorIds.us, uploaded.body.data.token, mapping);
    expect(imported.status).toBe(200);
    const stored = getDb().select().from(readings).where(eq(readings.sensorId, sensorIds.us)).orderBy(readings.at).all();
    expect(stored.map((r) => [r.at.toISOString(), r.tempC])).toEqual([
      ["2026-03-08T04:30:00.000Z", 8], // 23:30 EST (UTC−05:00); 46.4 °F = 8 °C
      ["2026-03-08T06:59:00.000Z", 5], // 01:59 EST; 41 °F = 5 °C
      ["2026-03-08T07:00:00.000Z", 4], // 03:00 EDT (UTC−04:00), one minute later; 39.2 °F = 4 °C
      ["2026-07-14T19:40:00.000Z", 2], // 15:40 EDT; 35.6 °F = 2 °C
    ]);
  });

  it("reads a Windows-1252 file (the degree sign as the byte 0xB0) with the unit in a column", async () => {
    const latin = (s: string) => Uint8Array.from([...s].map((ch) => (ch === "°" ? 0xb0 : ch.charCodeAt(0))));
    const uploaded = await upload(sensorIds.us, latin("Time,Temp,Unit\n2026-12-01T08:00:00Z,46.4,°F\n2026-12-01T08:01:00Z,8,°C\n"));
    expect(uploaded.body.data).toMatchObject({ encoding: "windows-1252", mapping: { unit: "column", unitColumn: "Unit" } });
    const preview = await step(previewRoute.POST, sensorIds.us, uploaded.body.data.token, { ...uploaded.body.data.mapping, timeZone: "UTC" });
    expect(preview.body.data.rows.map((r: { tempC: number; temperatureText: string }) => [r.temperatureText, r.tempC])).toEqual([
      ["46.4 °F", 8],
      ["8 °C", 8],
    ]);
  });

  it("refuses a local time that was skipped when clocks went forward, naming the fixed zone to choose", async () => {
    const text = "Timestamp,Temperature\n2026-03-29 01:30,5\n2026-03-29 02:30,5\n2026-03-29 03:30,5\n";
    const { token } = (await upload(sensorIds.us, text)).body.data;
    const mapping = { ...berlinMapping, deviceIdColumn: undefined };
    const preview = await step(previewRoute.POST, sensorIds.us, token, mapping);
    expect(preview.body.data.issues).toEqual([
      {
        line: 3,
        column: "Timestamp",
        value: "2026-03-29 02:30",
        message:
          "“2026-03-29 02:30” does not exist in Europe/Berlin: clocks went forward from UTC+01:00 to UTC+02:00 at 2026-03-29T01:00:00Z. If the logger's clock ignores daylight saving time, choose the time zone “UTC+01:00 all year” (Etc/GMT-1).",
      },
    ]);
    const fixed = await step(previewRoute.POST, sensorIds.us, token, { ...mapping, timeZone: "Etc/GMT-1" });
    expect(fixed.body.data.rows.map((r: { atMs: number }) => new Date(r.atMs).toISOString())).toEqual(["2026-03-29T00:30:00.000Z", "2026-03-29T01:30:00.000Z", "2026-03-29T02:30:00.000Z"]);
  });
});

describe("the remembered mapping", () => {
  it("is stored on the sensor after a successful import and prefilled at the next upload", async () => {
    const text = "Zeitpunkt;Wert;Einheit\n14.07.2026 10:00;4,5;C\n14.07.2026 10:05;4,6;C\n";
    const first = await upload(sensorIds.memo, text);
    expect(first.body.data.remembered).toBe(false);
    const mapping = { delimiter: ";", decimalSeparator: ",", headerLine: 1, timestampColumn: "Zeitpunkt", temperatureColumn: "Wert", unit: "column", unitColumn: "Einheit", dateOrder: "dmy", timeZone: "Europe/Berlin" };
    expect((await step(importRoute.POST, sensorIds.memo, first.body.data.token, mapping)).status).toBe(200);
    const sensor = getDb().select().from(sensors).where(eq(sensors.id, sensorIds.memo)).get()!;
    expect(sensor.timeZone).toBe("Europe/Berlin");
    expect(sensor.csvMapping).toEqual({ timestampColumn: "Zeitpunkt", temperatureColumn: "Wert", unit: "column", unitColumn: "Einheit", dateOrder: "dmy", decimalSeparator: ",", delimiter: ";" });

    const next = await upload(sensorIds.memo, "Zeitpunkt;Wert;Einheit\n15.07.2026 10:00;4;C\n");
    expect(next.body.data.remembered).toBe(true);
    expect(next.body.data.mapping).toMatchObject({ timestampColumn: "Zeitpunkt", temperatureColumn: "Wert", unit: "column", unitColumn: "Einheit", dateOrder: "dmy", timeZone: "Europe/Berlin" });
    const stored = getDb().select().from(readings).where(eq(readings.sensorId, sensorIds.memo)).orderBy(readings.at).all();
    expect(stored.map((r) => [r.at.toISOString(), r.tempC])).toEqual([
      ["2026-07-14T08:00:00.000Z", 4.5],
      ["2026-07-14T08:05:00.000Z", 4.6],
    ]);
  });
});

describe("excursions from an uploaded file", () => {
  it("are detected and stored in the import's transaction", async () => {
    // 5 °C, then 9–12 °C for 40 minutes (threshold 8 °C, at least 30 min), back to 5 °C.
    const temps = [5, 5, 9, 10, 11, 12, 12, 11, 10, 9, 9, 5, 5];
    const text = "Timestamp,Temperature\n" + temps.map((t, i) => `${new Date(Date.parse("2026-09-01T08:00:00Z") + i * 5 * MIN).toISOString()},${t}`).join("\n");
    const { token } = (await upload(sensorIds.excursion, text)).body.data;
    const imported = await step(importRoute.POST, sensorIds.excursion, token, { ...berlinMapping, deviceIdColumn: undefined });
    expect(imported.body.data.excursions).toEqual({ opened: 1, closed: 0, updated: 0 });
    const [stored] = getDb().select().from(excursions).where(eq(excursions.sensorId, sensorIds.excursion)).all();
    expect(stored).toMatchObject({ storageUnitId: unitId, thresholdC: 8, peakTempC: 12, endAt: new Date("2026-09-01T08:55:00Z"), startAt: new Date("2026-09-01T08:10:00Z") });
  });
});

describe("limits and refusals", () => {
  it("answers 413 past 100 MB without keeping the file", async () => {
    const boundary = "----headroom-test-boundary";
    const encoder = new TextEncoder();
    const chunk = encoder.encode("2026-07-01 00:00:00,4.5,LOG-C1\n".repeat(32 * 1024)); // ~1 MB
    let sent = 0;
    const body = new ReadableStream<Uint8Array>({
      pull(controller) {
        if (sent === 0) controller.enqueue(encoder.encode(`--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="huge.csv"\r\nContent-Type: text/csv\r\n\r\nTimestamp,Temperature,Device\n`));
        if (sent > MAX_CSV_UPLOAD_BYTES + 2 * chunk.length) {
          controller.enqueue(encoder.encode(`\r\n--${boundary}--\r\n`));
          controller.close();
          return;
        }
        controller.enqueue(chunk);
        sent += chunk.length;
      },
    });
    const before = fs.existsSync(csvDir) ? fs.readdirSync(csvDir).length : 0;
    const request = new Request(`http://localhost:3999/api/v1/sensors/${sensorIds.fridge}/csv-uploads`, {
      method: "POST",
      headers: { cookie: cookies.facilities, "content-type": `multipart/form-data; boundary=${boundary}` },
      body,
      duplex: "half",
    } as RequestInit);
    const response = await (uploadRoute.POST as Handler)(request, { params: Promise.resolve({ id: String(sensorIds.fridge) }) });
    expect(response.status).toBe(413);
    expect((await response.json()).error.message).toBe("The file is larger than 100 MB; split the logger's export into smaller files (by month, for example).");
    expect(fs.readdirSync(csvDir).length).toBe(before);
  });

  it("refuses an empty file, a workbook, and an unknown sensor", async () => {
    expect((await upload(sensorIds.fridge, "")).body.error.message).toBe("The chosen file is empty; choose the logger's export.");
    const workbook = await upload(sensorIds.fridge, new Uint8Array([0x50, 0x4b, 0x03, 0x04, 1, 2, 3]), { name: "export.xlsx" });
    expect(workbook.status).toBe(400);
    expect(workbook.body.error.message).toBe("export.xlsx is a workbook (XLSX), not a CSV file. Save the sheet as CSV and upload that.");
    expect((await upload(999_999, "a,b\n")).status).toBe(404);
  });

  it("keeps an upload for its uploader, sensor and one hour only", async () => {
    const { token } = (await upload(sensorIds.fridge, berlinFile(3))).body.data;
    expect((await step(previewRoute.POST, sensorIds.fridge, token, berlinMapping, cookies.admin)).status).toBe(404);
    expect((await step(previewRoute.POST, sensorIds.us, token, berlinMapping)).status).toBe(404);
    expect((await step(previewRoute.POST, sensorIds.fridge, token, berlinMapping)).status).toBe(200);
    const metaPath = path.join(csvDir, `${token}.json`);
    const meta = JSON.parse(fs.readFileSync(metaPath, "utf8"));
    fs.writeFileSync(metaPath, JSON.stringify({ ...meta, createdAtMs: meta.createdAtMs - CSV_UPLOAD_TTL_MS - 1 }));
    const expired = await step(previewRoute.POST, sensorIds.fridge, token, berlinMapping);
    expect(expired.status).toBe(404);
    expect(expired.body.error.message).toMatch(/expired/);
    expect(fs.existsSync(path.join(csvDir, `${token}.csv`))).toBe(false);
  });

  it("answers 400 with field errors for a mapping naming columns the file lacks", async () => {
    const { token } = (await upload(sensorIds.fridge, berlinFile(3))).body.data;
    const response = await step(previewRoute.POST, sensorIds.fridge, token, { ...berlinMapping, temperatureColumn: "Temp" });
    expect(response.status).toBe(400);
    expect(response.body.error.fields).toEqual({ temperatureColumn: ["The file has no column “Temp”."] });
  });

  it("answers 401 without a session and 403 to researchers and auditors, storing nothing", async () => {
    const before = await getDb().$count(readings);
    expect((await upload(sensorIds.fridge, berlinFile(3), { cookie: "" })).status).toBe(401);
    for (const role of ["researcher", "auditor"] as const) {
      const refused = await upload(sensorIds.fridge, berlinFile(3), { cookie: cookies[role] });
      expect(refused.status).toBe(403);
      expect(refused.body.error.code).toBe("forbidden");
      for (const handler of [previewRoute.POST, importRoute.POST] as Handler[]) {
        expect((await step(handler, sensorIds.fridge, "0123456789abcdef0123456789abcdef", berlinMapping, cookies[role])).status).toBe(403);
      }
    }
    for (const role of ["admin", "safety_officer", "facilities"] as const) expect((await upload(sensorIds.fridge, berlinFile(3), { cookie: cookies[role] })).status).toBe(201);
    expect(await getDb().$count(readings)).toBe(before);
  });
});
