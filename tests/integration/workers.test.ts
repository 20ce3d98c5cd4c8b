/**
 * The worker threads: tasks run against this test file's own database, their errors arrive as the
 * same classes, a thread that dies takes only its own task with it, the register workbook streams
 * out of a worker (and stops when its reader goes away), a re-assessment job runs to the end in a
 * worker, and the request thread keeps ticking while a worker is busy. Every row below is invented.
 */
import { randomBytes } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { MessageChannel } from "node:worker_threads";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import ExcelJS from "exceljs";
import Database from "better-sqlite3";
import { databasePath, getDb } from "@/db/client";
import { auditEvents, jobs, readings, rooms, sensors, settings, sites, storageUnits, type User } from "@/db/schema";
import * as exportRoute from "@/app/api/v1/exports/register.xlsx/route";
import * as readingsRoute from "@/app/api/v1/readings/route";
import { queueReassessment } from "@/lib/assessment/jobs";
import { reassessRooms } from "@/lib/assessment/service";
import { createApiKey } from "@/lib/api-keys/service";
import { DomainError, ValidationError } from "@/lib/errors";
import { ExportCancelledError } from "@/lib/exports/table-sheet";
import { ImportFileError } from "@/lib/imports/errors";
import { BatchRejectedError } from "@/lib/temperatures/ingest";
import { closeWorkerPool, createWorkerPool, runNamedTask, runTask, WorkerStoppedError } from "@/lib/workers/pool";
import { readableFromPort } from "@/lib/workers/port-stream";
import { writeGateRaised } from "@/lib/workers/write-gate";
import * as sitesRoute from "@/app/api/v1/sites/route";
import { buildWorkerBundle } from "@/scripts/build-workers";
import { call, makeUser, sessionCookieFor } from "./helpers/world";

const FINDING_COUNT = 3_000;
const TRACE_TEXT_BYTES = 3_000;

let auditor: User;
let admin: User;
let roomIds: number[];

beforeAll(() => {
  const db = getDb();
  auditor = makeUser("auditor", { name: "Ada Auditor" });
  admin = makeUser("admin", { name: "Abe Admin" });
  const siteId = db.insert(sites).values({ name: "Worker campus" }).returning().get().id;
  roomIds = ["W-1", "W-2", "W-3"].map((code) => db.insert(rooms).values({ siteId, code, name: `Lab ${code}`, kind: "laboratory", floorAreaM2: 30, heightM: 3, airChangesPerHour: 6, designMaxTempC: 28 }).returning().get().id);
  const unitId = db.insert(storageUnits).values({ roomId: roomIds[0], code: "FC-1", name: "Cabinet", kind: "flammable_cabinet", internalVolumeL: 400 }).returning().get().id;
  db.insert(sensors).values({ externalId: "LOG-W1", name: "Worker test logger", storageUnitId: unitId }).run();
  // Findings with long, incompressible trace text: a workbook of several MB, more than the worker
  // may run ahead of its reader.
  const sqlite = db.$client;
  const insertFinding = sqlite.prepare(
    "insert into findings (fingerprint, rule, severity, status, scenario, title, site_id, room_id, storage_unit_id, value, limit_value, ratio, unit) values (?, 'enclosure-lfl', 'high', 'open', 'in_control', ?, ?, ?, ?, 0.5, 0.25, 2, '% LFL')",
  );
  const insertTrace = sqlite.prepare("insert into finding_traces (finding_id, trace, text, text_xml_safe) values (?, '{}', ?, 1)");
  sqlite.transaction(() => {
    for (let n = 1; n <= FINDING_COUNT; n++) {
      const id = insertFinding.run(`worker-test|${n}`, `Invented finding ${n}`, siteId, roomIds[0], unitId).lastInsertRowid;
      insertTrace.run(id, randomBytes(TRACE_TEXT_BYTES / 2).toString("hex"));
    }
  })();
});

afterAll(async () => {
  await closeWorkerPool();
});

describe("a task in a worker thread", () => {
  it("writes through its own connection to this test's database, and the main connection sees the write", async () => {
    const { key } = (await runNamedTask("diagnostics.write", { key: "worker.test", value: { from: "worker" } })) as { key: string };
    expect(key).toBe("worker.test");
    const row = getDb().select().from(settings).where(eq(settings.key, "worker.test")).get();
    expect(row?.value).toEqual({ from: "worker" });
  });

  it("brings a domain error back as the same class, with its code, status, fields and other properties", async () => {
    const validation = await runNamedTask("diagnostics.fail", { kind: "validation" }).catch((error: unknown) => error);
    expect(validation).toBeInstanceOf(ValidationError);
    expect(validation).toMatchObject({ code: "invalid_input", status: 400, message: "Check the highlighted fields.", fields: { amount: ["Enter an amount above 0 mL."] } });

    const domain = await runNamedTask("diagnostics.fail", { kind: "domain" }).catch((error: unknown) => error);
    expect(domain).toBeInstanceOf(DomainError);
    expect(domain).toMatchObject({ code: "upload_not_found", status: 404, detail: { line: 7 } });

    const plain = (await runNamedTask("diagnostics.fail", { kind: "plain" }).catch((error: unknown) => error)) as Error;
    expect(plain).not.toBeInstanceOf(DomainError);
    expect(plain.name).toBe("TypeError");
    expect(plain.message).toBe("Cannot read properties of undefined (reading 'id')");
    expect(plain.stack).toContain("worker task diagnostics.fail");

    // The services' own errors: a batch with a bad row, a file without the required columns.
    const batch = (await runTask("readings.ingest", { readings: [{ sensor: "LOG-W1", at: "2026-07-14T15:40:00+02:00", tempC: 5 }, { sensor: "LOG-NONE", at: "2026-07-14T15:45:00+02:00", tempC: 5 }] }).catch(
      (error: unknown) => error,
    )) as BatchRejectedError;
    expect(batch).toBeInstanceOf(BatchRejectedError);
    expect(batch.status).toBe(400);
    expect(batch.rows).toEqual([{ index: 1, field: "sensor", message: "No sensor has the device id “LOG-NONE”. Register it first." }]);

    const bytes = new TextEncoder().encode("label,amount\nHR-1,2\n");
    const file = (await runTask("imports.previewContainers", { file: { bytes, fileName: "containers.csv" } }).catch((error: unknown) => error)) as ImportFileError;
    expect(file).toBeInstanceOf(ImportFileError);
    expect(file.code).toBe("missing_columns");
    expect(file.status).toBe(400);
    expect(file.columns).toContain("cas");
  });

  it("rejects the task of a thread that ends inside a write transaction, writes nothing of it, and runs the next task", async () => {
    const stopped = (await runNamedTask("diagnostics.exitInTransaction", { key: "worker.crashed" }).catch((error: unknown) => error)) as WorkerStoppedError;
    expect(stopped).toBeInstanceOf(WorkerStoppedError);
    expect(stopped).toMatchObject({ code: "worker_stopped", status: 500, task: "diagnostics.exitInTransaction", reason: "worker exited with code: 3" });
    expect(getDb().select().from(settings).where(eq(settings.key, "worker.crashed")).get()).toBeUndefined();
    // The dead thread's write lock is gone, and so is its write gate: this connection writes, and so does the next task.
    expect(writeGateRaised()).toBe(false);
    getDb().insert(settings).values({ key: "worker.main-after-crash", value: 1 }).run();
    await runNamedTask("diagnostics.write", { key: "worker.after-crash", value: 2 });
    expect(getDb().select().from(settings).where(eq(settings.key, "worker.after-crash")).get()?.value).toBe(2);
  });

  it("ends a thread that runs out of memory, not the process, and the pool runs the next task", async () => {
    const pool = createWorkerPool({ maxThreads: 1, maxOldGenerationSizeMb: 48 });
    try {
      const stopped = (await runNamedTask("diagnostics.exhaustMemory", {}, { pool }).catch((error: unknown) => error)) as WorkerStoppedError;
      expect(stopped).toBeInstanceOf(WorkerStoppedError);
      expect(stopped).toMatchObject({ code: "worker_stopped", status: 413 });
      expect(stopped.reason).toMatch(/out of memory/i);
      expect(await runNamedTask("diagnostics.busy", { ms: 1 }, { pool })).toMatchObject({ loops: expect.any(Number) });
    } finally {
      await pool.destroy();
    }
  }, 60_000);

  it("keeps the request thread's event loop turning while a worker computes", async () => {
    await runNamedTask("diagnostics.busy", { ms: 1 }); // a thread is up
    let last = performance.now();
    let largestGapMs = 0;
    let ticks = 0;
    const timer = setInterval(() => {
      const now = performance.now();
      largestGapMs = Math.max(largestGapMs, now - last);
      last = now;
      ticks++;
    }, 10);
    try {
      const { loops } = (await runNamedTask("diagnostics.busy", { ms: 1_500 })) as { loops: number };
      expect(loops).toBeGreaterThan(0);
    } finally {
      clearInterval(timer);
    }
    expect(ticks).toBeGreaterThan(50);
    expect(largestGapMs).toBeLessThan(200);
  });

  it("lets a write on the request thread wait for a worker's long write without stopping the event loop", async () => {
    const cookie = await sessionCookieFor(admin);
    await runNamedTask("diagnostics.busy", { ms: 1 }); // a thread is up
    const tick = () => {
      let last = performance.now();
      const gap = { largestMs: 0 };
      const timer = setInterval(() => {
        const now = performance.now();
        gap.largestMs = Math.max(gap.largestMs, now - last);
        last = now;
      }, 5);
      const stop = () => {
        // A block that ends just before stop() is seen here, not by the timer.
        gap.largestMs = Math.max(gap.largestMs, performance.now() - last);
        clearInterval(timer);
      };
      return { gap, stop };
    };
    const createSite = (name: string) =>
      call(sitesRoute.POST, { method: "POST", path: "/api/v1/sites", cookie, body: { name } });

    // With the gate: the worker holds the write lock for 1.2 s; the route's write waits for it
    // asynchronously and lands after it, while this thread's timers keep firing.
    const ticking = tick();
    const longWrite = runNamedTask("diagnostics.longWrite", { key: "worker.long-write", ms: 1_200 });
    while (!writeGateRaised()) await new Promise((resolve) => setTimeout(resolve, 2));
    const created = await createSite("Gate test campus");
    ticking.stop();
    await longWrite;
    expect(created.status).toBe(201);
    expect(getDb().select().from(settings).where(eq(settings.key, "worker.long-write")).get()).toBeDefined();
    expect(ticking.gap.largestMs).toBeLessThan(150);
    expect(writeGateRaised()).toBe(false);

    // Without the gate the same write waits in SQLite's busy handler, and the whole thread with it.
    const blocked = tick();
    const ungated = runNamedTask("diagnostics.longWrite", { key: "worker.ungated", ms: 600, gate: false });
    // Until the worker holds the write lock (a second connection that does not wait sees it busy).
    const probe = new Database(databasePath(), { timeout: 0 });
    const locked = () => {
      try {
        probe.exec("BEGIN IMMEDIATE; ROLLBACK");
        return false;
      } catch {
        return true;
      }
    };
    while (!locked()) await new Promise((resolve) => setTimeout(resolve, 2));
    probe.close();
    expect((await createSite("Blocked campus")).status).toBe(201);
    blocked.stop();
    await ungated;
    expect(blocked.gap.largestMs).toBeGreaterThan(250);
  });
});

describe("the production bundle", () => {
  it("loads in a plain thread (no tsx, no react-server flag) and runs the services with their errors", async () => {
    const bundle = await buildWorkerBundle(path.join(".next", "workers", `test-${process.pid}.mjs`));
    const pool = createWorkerPool({ maxThreads: 1, bundle });
    try {
      await runNamedTask("diagnostics.write", { key: "worker.bundle", value: "bundled" }, { pool });
      expect(getDb().select().from(settings).where(eq(settings.key, "worker.bundle")).get()?.value).toBe("bundled");
      const batch = (await runNamedTask("readings.ingest", { readings: [{ sensor: "LOG-NONE", at: "2026-07-14T15:45:00+02:00", tempC: 5 }] }, { pool }).catch((error: unknown) => error)) as BatchRejectedError;
      expect(batch).toBeInstanceOf(BatchRejectedError);
      expect(batch.rows).toEqual([{ index: 0, field: "sensor", message: "No sensor has the device id “LOG-NONE”. Register it first." }]);
    } finally {
      await pool.destroy();
      for (const file of [bundle, `${bundle}.map`]) fs.rmSync(file, { force: true });
    }
  }, 60_000);
});

describe("the register workbook from a worker", () => {
  it("streams a valid workbook through the download route, with the download in the audit log", async () => {
    const response = await exportRoute.GET(new Request("http://localhost:3999/api/v1/exports/register.xlsx", { headers: { cookie: await sessionCookieFor(auditor) } }), { params: Promise.resolve({}) });
    expect(response.status).toBe(200);
    const bytes = Buffer.from(await response.arrayBuffer());
    expect(bytes.byteLength).toBeGreaterThan(4 * 1024 * 1024);
    const workbook = new ExcelJS.Workbook();
    await workbook.xlsx.load(bytes as unknown as ArrayBuffer);
    const sheet = workbook.getWorksheet("Findings")!;
    expect(sheet.actualRowCount).toBe(FINDING_COUNT + 1);
    expect(workbook.getWorksheet("Finding traces")!.actualRowCount).toBeGreaterThan(FINDING_COUNT);
    const audit = getDb().select().from(auditEvents).where(eq(auditEvents.entityId, "register.xlsx")).all();
    expect(audit.map((a) => a.actorId)).toEqual([auditor.id]);
  });

  it("waits for a reader that reads nothing, and stops when the reader cancels", async () => {
    const { port1, port2 } = new MessageChannel();
    const body = readableFromPort(port1);
    const task = runTask("exports.registerWorkbook", { port: port2, generatedBy: "Ada Auditor <ada@example.test>", nowMs: Date.parse("2026-08-01T09:30:00Z") }, { transferList: [port2] });
    const settled = task.then(
      () => "finished",
      (error: unknown) => error,
    );
    const reader = body.getReader();
    const first = await reader.read();
    expect(first.done).toBe(false);
    // With nothing read for a while the worker waits: the workbook is larger than it may run ahead.
    const early = await Promise.race([settled, new Promise((resolve) => setTimeout(() => resolve("still running"), 1_000))]);
    expect(early).toBe("still running");
    await reader.cancel();
    const outcome = await settled;
    expect(outcome).toBeInstanceOf(ExportCancelledError);
  });
});

describe("background re-assessment in a worker", () => {
  it("runs a queued job to done with its progress at the total", async () => {
    const job = queueReassessment(getDb(), { roomIds, reason: "worker test" }, admin.id);
    const result = await runTask("assessment.runJob", { jobId: job.id });
    expect(result).toEqual({ id: job.id, status: "done", progress: roomIds.length, total: roomIds.length });
    const stored = getDb().select().from(jobs).where(eq(jobs.id, job.id)).get()!;
    expect(stored).toMatchObject({ status: "done", progress: 3, total: 3, error: null });
    const assessed = getDb().select({ assessedAt: rooms.assessedAt }).from(rooms).all();
    expect(assessed.every((r) => r.assessedAt !== null)).toBe(true);
    // The worker digested the rooms with this process's key: nothing changed, so nothing is assessed again here.
    const again = getDb().transaction((tx) => reassessRooms(tx, roomIds, { reason: "worker test, again" }));
    expect(again.roomsUnchanged).toBe(roomIds.length);
  });
});

describe("a big batch from the logger API", () => {
  it("is stored in a worker all or nothing, with the same answers", async () => {
    const { key } = createApiKey({ id: admin.id, email: admin.email, name: admin.name, role: "admin" }, { name: "Gateway", scopes: ["readings:write"] });
    const startMs = Date.parse("2026-06-01T00:00:00Z");
    const batch = Array.from({ length: 1_200 }, (_, i) => ({ sensor: "LOG-W1", at: new Date(startMs + i * 60_000).toISOString(), tempC: 20 + (i % 5) / 10 }));
    const send = async (readings: unknown[]) => {
      const response = await readingsRoute.POST(
        new Request("http://localhost/api/v1/readings", { method: "POST", headers: { "content-type": "application/json", authorization: `Bearer ${key}` }, body: JSON.stringify({ readings }) }),
      );
      return { status: response.status, body: await response.json() };
    };
    const refused = await send([...batch.slice(0, 1_100), { sensor: "LOG-W1", at: "yesterday", tempC: 20 }]);
    expect(refused.status).toBe(400);
    expect(refused.body.error.code).toBe("batch_rejected");
    expect(refused.body.error.rows).toEqual([
      { index: 1_100, field: "at", message: "at must be ISO-8601 with an offset (Z or ±hh:mm), e.g. 2026-07-14T15:40:00+02:00." },
    ]);
    const sensorId = getDb().select().from(sensors).where(eq(sensors.externalId, "LOG-W1")).get()!.id;
    const stored = () => getDb().$count(readings, eq(readings.sensorId, sensorId));
    expect(await stored()).toBe(0);
    const accepted = await send(batch);
    expect(accepted).toEqual({ status: 202, body: { accepted: 1_200, duplicates: 0, conflicts: 0, conflictRows: [] } });
    expect(await stored()).toBe(1_200);
  });
});
