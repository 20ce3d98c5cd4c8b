/**
 * Logger-file uploads for one sensor: the file is streamed to disk under a random token, its layout
 * is detected, a preview reads it with the person's mapping, and the import stores every reading
 * or none.
 *
 * Memory stays bounded whatever the file's size: the file is never held whole, neither as bytes
 * nor as rows. It is read in chunks; each chunk's rows are checked and their valid readings put in
 * a per-scan TEMP table (SQLite keeps it in a temporary file, with a page cache of its own). Why a
 * staging table rather than two passes over the file: one parse instead of two, and the check for
 * an instant given twice with different values needs every instant seen so far, which in a
 * JavaScript Map would grow with the file. Each chunk is one short synchronous transaction on the
 * staging table; nothing stays open across an await. Only when the whole file has no problem does
 * one transaction copy the staged readings into `readings` (INSERT … SELECT … ON CONFLICT DO
 * NOTHING, so a reading already stored counts as a duplicate), refresh the sensor's excursions,
 * remember the mapping and record the audit event.
 */
import "server-only";
import { randomBytes } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import type Database from "better-sqlite3";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { sensors, type Sensor } from "@/db/schema";
import { recordAudit } from "@/lib/audit/record";
import type { SessionUser } from "@/lib/auth/session";
import { readingLimits, uploadDir } from "@/lib/config";
import { ConflictError, DomainError, NotFoundError, ValidationError } from "@/lib/errors";
import { streamMultipartFile } from "@/lib/files/multipart-stream";
import { formatCount } from "@/lib/format/numbers";
import { LOGGER_CSV_LIMITS } from "@/lib/limits";
import { log } from "@/lib/log";
import {
  createRowReader,
  CsvLimitError,
  CsvMappingError,
  CsvRecordError,
  CsvRecordReader,
  detectEncoding,
  detectLayout,
  duplicateError,
  isBlankRecord,
  numberedHeaders,
  toRememberedMapping,
  type CsvMapping,
  type CsvReading,
  type CsvRowError,
  type DetectedLayout,
  type TextEncoding,
} from "./csv";
import { reassessRooms, roomsOfSensors } from "@/lib/assessment/service";
import { refreshExcursions, type RefreshResult } from "./excursion-store";
import { holdingWriteGate } from "@/lib/workers/write-gate";

export const MAX_CSV_UPLOAD_BYTES = LOGGER_CSV_LIMITS.maxUploadBytes;
/** An upload waits this long for its import; then it is deleted. */
export const CSV_UPLOAD_TTL_MS = 60 * 60 * 1000;
/** The preview and a refused import list this many problems (in file order) and count the rest. */
export const MAX_LISTED_ISSUES = 500;
export const PREVIEW_ROWS = 20;

const TOKEN = /^[0-9a-f]{32}$/;
const READ_CHUNK_BYTES = 256 * 1024;
const HEAD_BYTES = 64 * 1024;
const FILE_NAME_MAX_LENGTH = 200;

type UploadMeta = { sensorId: number; userId: number; fileName: string; sizeBytes: number; encoding: TextEncoding; createdAtMs: number };

export type CsvUploadInfo = {
  token: string;
  fileName: string;
  sizeBytes: number;
  encoding: TextEncoding;
  expiresAtMs: number;
  layout: DetectedLayout;
  /** Detected layout, the sensor's remembered choices where they fit this file, then the guesses. */
  mapping: Partial<CsvMapping>;
  /** The sensor had a mapping from an earlier import, and it was used. */
  remembered: boolean;
  sensor: { id: number; externalId: string; name: string };
};

/** A reading as it will be stored, beside what the file says. */
export type CsvPreviewRow = { line: number; atMs: number; tempC: number; timeText: string; temperatureText: string };

export type CsvScanSummary = {
  /** Data rows in the file (blank lines not counted). */
  rowCount: number;
  /** Distinct instants with a valid reading. */
  readingCount: number;
  /** Rows repeating an earlier row's instant and value: stored once. */
  repeatedInFile: number;
  firstAtMs: number | null;
  lastAtMs: number | null;
  issues: CsvRowError[];
  issueCount: number;
  issueLineCount: number;
};

/** A row whose instant already holds a different stored temperature: the stored one is kept. */
export type CsvConflictRow = { line: number; atMs: number; tempC: number; storedTempC: number };

export type CsvPreview = CsvScanSummary & {
  rows: CsvPreviewRow[];
  /** Readings whose instant is already stored for this sensor (not stored again). */
  alreadyStored: number;
  /** …of which the stored temperature differs from the file's (conflicts: the stored one is kept). */
  conflicts: number;
  /** The first conflicts in file order (at most MAX_LISTED_ISSUES). */
  conflictRows: CsvConflictRow[];
};

export type CsvImportResult = {
  accepted: number;
  duplicates: number;
  alreadyStored: number;
  /** Readings of the file that differ from the stored ones for their instants: not stored, the stored ones kept. */
  conflicts: number;
  repeatedInFile: number;
  rowCount: number;
  firstAtMs: number | null;
  lastAtMs: number | null;
  excursions: RefreshResult;
};

/** Problems in rows: nothing was written. Carries the listed problems and their total. */
export class CsvImportRejectedError extends DomainError {
  constructor(readonly summary: CsvScanSummary) {
    const { issueCount, issueLineCount, rowCount } = summary;
    super(
      "import_rejected",
      `Nothing was imported: ${issueCount === 1 ? "1 problem" : `${formatCount(issueCount)} problems`} on ` +
        `${issueLineCount === 1 ? "1 row" : `${formatCount(issueLineCount)} rows`} of ${formatCount(rowCount)}. Fix them in the file (or the column choices) and import again.`,
      400,
    );
  }
}

class UploadGoneError extends DomainError {
  constructor() {
    super("upload_not_found", "That upload was not found or has expired (uploads are kept for an hour). Choose the file again.", 404);
  }
}

// ---------------------------------------------------------------------------------------------
// Stored uploads
// ---------------------------------------------------------------------------------------------

function uploadsDir(): string {
  return path.join(uploadDir(), "csv-uploads");
}

// Paths below are made at run time from the upload folder; `turbopackIgnore` keeps the build from
// tracing the whole project for them.
function filePaths(token: string): { csv: string; meta: string } {
  if (!TOKEN.test(token)) throw new UploadGoneError();
  return { csv: path.join(uploadsDir(), `${token}.csv`), meta: path.join(uploadsDir(), `${token}.json`) };
}

function removeUpload(token: string): void {
  const { csv, meta } = filePaths(token);
  fs.rmSync(csv, { force: true });
  fs.rmSync(meta, { force: true });
}

/** Deletes uploads past their time (run at every new upload). */
export function sweepExpiredUploads(nowMs = Date.now()): number {
  let removed = 0;
  let names: string[];
  try {
    names = fs.readdirSync(uploadsDir());
  } catch {
    return 0;
  }
  for (const name of names) {
    const full = path.join(uploadsDir(), name);
    try {
      if (nowMs - fs.statSync(full).mtimeMs > CSV_UPLOAD_TTL_MS) {
        fs.rmSync(full, { force: true });
        removed++;
      }
    } catch (error) {
      log.warn({ err: error, name }, "could not sweep an expired logger upload");
    }
  }
  return removed;
}

function loadSensor(sensorId: number): Sensor {
  const sensor = getDb().select().from(sensors).where(eq(sensors.id, sensorId)).get();
  if (!sensor) throw new NotFoundError("That sensor");
  if (!sensor.active) throw new ConflictError(`Sensor ${sensor.externalId} is switched off in Headroom; switch it on to upload its readings.`);
  return sensor;
}

function openUpload(actor: SessionUser, sensorId: number, token: string, nowMs = Date.now()): { meta: UploadMeta; csvPath: string } {
  const { csv, meta: metaPath } = filePaths(token);
  let meta: UploadMeta;
  try {
    meta = JSON.parse(fs.readFileSync(/*turbopackIgnore: true*/ metaPath, "utf8")) as UploadMeta;
  } catch {
    throw new UploadGoneError();
  }
  if (meta.userId !== actor.id || meta.sensorId !== sensorId || !fs.existsSync(/*turbopackIgnore: true*/ csv)) throw new UploadGoneError();
  if (nowMs - meta.createdAtMs > CSV_UPLOAD_TTL_MS) {
    removeUpload(token);
    throw new UploadGoneError();
  }
  return { meta, csvPath: csv };
}

function cleanFileName(name: string): string {
  const base = name.split(/[\\/]/).pop()?.replace(/[\u0000-\u001f\u007f]/g, "").trim();
  return (base || "logger-file.csv").slice(0, FILE_NAME_MAX_LENGTH);
}

function prefilledMapping(layout: DetectedLayout, sensor: Sensor): { mapping: Partial<CsvMapping>; remembered: boolean } {
  const mapping: Partial<CsvMapping> = {
    delimiter: layout.delimiter,
    decimalSeparator: layout.decimalSeparator,
    headerLine: layout.headerLine,
    ...layout.suggested,
  };
  const saved = sensor.csvMapping ?? null;
  let remembered = false;
  if (saved) {
    const has = (name: string | undefined) => !!name && layout.headers.includes(name);
    const columnsFit =
      has(saved.temperatureColumn) &&
      (has(saved.timestampColumn) || (has(saved.dateColumn) && has(saved.timeColumn))) &&
      (!saved.unitColumn || has(saved.unitColumn)) &&
      (!saved.deviceIdColumn || has(saved.deviceIdColumn));
    if (columnsFit) {
      remembered = true;
      mapping.timestampColumn = saved.timestampColumn;
      mapping.dateColumn = saved.dateColumn;
      mapping.timeColumn = saved.timeColumn;
      mapping.temperatureColumn = saved.temperatureColumn;
      mapping.unitColumn = saved.unitColumn;
      mapping.deviceIdColumn = saved.deviceIdColumn;
      // The unit and date order go with the layout: a file laid out differently keeps the guesses.
      if (saved.unit) mapping.unit = saved.unit as CsvMapping["unit"];
      if (saved.dateOrder) mapping.dateOrder = saved.dateOrder as CsvMapping["dateOrder"];
    }
  }
  if (sensor.timeZone) mapping.timeZone = sensor.timeZone;
  return { mapping, remembered };
}

async function register(sensor: Sensor, actor: SessionUser, token: string, fileName: string, sizeBytes: number, firstBytes: Uint8Array): Promise<CsvUploadInfo> {
  const paths = filePaths(token);
  if (sizeBytes === 0) {
    removeUpload(token);
    throw new ValidationError("The chosen file is empty; choose the logger's export.", { file: ["The chosen file is empty."] });
  }
  const encoding = detectEncoding(firstBytes, fileName);
  if (!encoding.ok) {
    removeUpload(token);
    throw new ValidationError(encoding.message, { file: [encoding.message] });
  }
  const head = new TextDecoder(encoding.encoding).decode(firstBytes, { stream: true });
  const layout = detectLayout(head, sizeBytes <= firstBytes.length);
  refuseOverLimits(() => new CsvRecordReader(layout.delimiter).push(head));
  const createdAtMs = Date.now();
  const meta: UploadMeta = { sensorId: sensor.id, userId: actor.id, fileName, sizeBytes, encoding: encoding.encoding, createdAtMs };
  fs.writeFileSync(paths.meta, JSON.stringify(meta), { mode: 0o600 });
  const { mapping, remembered } = prefilledMapping(layout, sensor);
  return {
    token,
    fileName,
    sizeBytes,
    encoding: encoding.encoding,
    expiresAtMs: createdAtMs + CSV_UPLOAD_TTL_MS,
    layout,
    mapping,
    remembered,
    sensor: { id: sensor.id, externalId: sensor.externalId, name: sensor.name },
  };
}

/** A row over LOGGER_CSV_LIMITS is refused whole (400 naming its line): the file cannot be read. */
function refuseOverLimits<T>(read: () => T): T {
  try {
    return read();
  } catch (error) {
    if (error instanceof CsvLimitError) throw new ValidationError(`The file cannot be read. ${error.message}`, { file: [error.message] });
    throw error;
  }
}

function newToken(): string {
  fs.mkdirSync(uploadsDir(), { recursive: true, mode: 0o700 });
  sweepExpiredUploads();
  return randomBytes(16).toString("hex");
}

/** The multipart field `file` of the request, streamed to disk (at most 100 MB, else 413). */
export async function startCsvUpload(actor: SessionUser, sensorId: number, request: Request): Promise<CsvUploadInfo> {
  const sensor = loadSensor(sensorId);
  const token = newToken();
  const { csv } = filePaths(token);
  const streamed = await streamMultipartFile(request, {
    field: "file",
    maxBytes: MAX_CSV_UPLOAD_BYTES,
    destPath: csv,
    tooLargeHint: "split the logger's export into smaller files (by month, for example).",
    missingMessage: "Choose the logger's CSV file, sent as multipart/form-data in the field “file”.",
  });
  try {
    return await register(sensor, actor, token, cleanFileName(streamed.fileName), streamed.sizeBytes, streamed.firstBytes);
  } catch (error) {
    removeUpload(token);
    throw error;
  }
}

/** The same as an upload, from a file on this machine (scripts and the benchmark). */
export async function startCsvUploadFromFile(actor: SessionUser, sensorId: number, sourcePath: string): Promise<CsvUploadInfo> {
  const sensor = loadSensor(sensorId);
  const sizeBytes = fs.statSync(sourcePath).size;
  if (sizeBytes > MAX_CSV_UPLOAD_BYTES) {
    const message = `The file is larger than ${MAX_CSV_UPLOAD_BYTES / 1024 / 1024} MB.`;
    throw new ValidationError(message, { file: [message] });
  }
  const token = newToken();
  const { csv } = filePaths(token);
  await fs.promises.copyFile(sourcePath, csv, fs.constants.COPYFILE_EXCL);
  const handle = await fs.promises.open(/*turbopackIgnore: true*/ csv, "r");
  const firstBytes = new Uint8Array(Math.min(HEAD_BYTES, sizeBytes));
  await handle.read(firstBytes, 0, firstBytes.length, 0);
  await handle.close();
  try {
    return await register(sensor, actor, token, cleanFileName(path.basename(sourcePath)), sizeBytes, firstBytes);
  } catch (error) {
    removeUpload(token);
    throw error;
  }
}

// ---------------------------------------------------------------------------------------------
// Reading a stored upload
// ---------------------------------------------------------------------------------------------

/** Rows per multi-row INSERT into the staging table (a third of the cost of one row per statement). */
const STAGE_BATCH = 100;

/**
 * The per-scan staging table: one row per distinct instant, with the line it came from. Readings
 * are added in batches; a batch reports, for each reading, the earlier line that already had its
 * instant (null when it was new).
 */
class StagingTable {
  readonly name = `csv_stage_${randomBytes(8).toString("hex")}`;
  readonly pending: CsvReading[] = [];
  private readonly insertOne: Database.Statement;
  private readonly insertBatch: Database.Statement;
  private readonly find: Database.Statement;
  private readonly args = new Array<number>(STAGE_BATCH * 3);

  constructor(private readonly sqlite: Database.Database) {
    sqlite.exec(`CREATE TEMP TABLE ${this.name} (at INTEGER PRIMARY KEY, temp_c REAL NOT NULL, line INTEGER NOT NULL)`);
    const insert = `INSERT INTO temp.${this.name} (at, temp_c, line) VALUES`;
    this.insertOne = sqlite.prepare(`${insert} (?, ?, ?) ON CONFLICT(at) DO NOTHING`);
    this.insertBatch = sqlite.prepare(`${insert} ${Array(STAGE_BATCH).fill("(?, ?, ?)").join(", ")} ON CONFLICT(at) DO NOTHING`);
    this.find = sqlite.prepare(`SELECT line, temp_c AS tempC FROM temp.${this.name} WHERE at = ?`);
  }

  /** Stores the pending readings (call inside a transaction). Null when every one was new. */
  flush(): ({ line: number; tempC: number } | null)[] | null {
    const batch = this.pending;
    if (batch.length === 0) return null;
    let inserted = 0;
    if (batch.length === STAGE_BATCH) {
      for (let k = 0; k < STAGE_BATCH; k++) {
        this.args[3 * k] = batch[k].atMs;
        this.args[3 * k + 1] = batch[k].tempC;
        this.args[3 * k + 2] = batch[k].line;
      }
      inserted = this.insertBatch.run(this.args).changes;
    } else {
      for (const r of batch) inserted += this.insertOne.run(r.atMs, r.tempC, r.line).changes;
    }
    let earlier: ({ line: number; tempC: number } | null)[] | null = null;
    if (inserted < batch.length) {
      // Rare: some instant was already there. The row holding it names the line that came first.
      earlier = batch.map((r) => {
        const found = this.find.get(r.atMs) as { line: number; tempC: number };
        return found.line === r.line ? null : found;
      });
    }
    batch.length = 0;
    return earlier;
  }

  drop(): void {
    this.sqlite.exec(`DROP TABLE IF EXISTS temp.${this.name}`);
  }
}

type Scan = CsvScanSummary & { rows: CsvPreviewRow[]; stage: StagingTable };

function fileIssue(line: number, message: string): CsvRowError {
  return { line, column: "(file)", value: "", message };
}

/**
 * Reads the stored file once with the mapping: every row checked, valid readings staged. The
 * caller drops the returned stage.
 */
async function scanUpload(meta: UploadMeta, csvPath: string, mapping: CsvMapping, deviceId: string): Promise<Scan> {
  const sqlite = getDb().$client;
  const stage = new StagingTable(sqlite);
  const summary: Scan = { rowCount: 0, readingCount: 0, repeatedInFile: 0, firstAtMs: null, lastAtMs: null, issues: [], issueCount: 0, issueLineCount: 0, rows: [], stage };
  let reader: ReturnType<typeof createRowReader> | null = null;
  let lastLine = 0;
  const rowErrors: CsvRowError[] = [];

  const addIssues = (list: CsvRowError[]) => {
    if (!list.length) return;
    summary.issueCount += list.length;
    summary.issueLineCount += 1;
    for (const issue of list) if (summary.issues.length < MAX_LISTED_ISSUES) summary.issues.push(issue);
  };

  const startReading = (headers: string[]) => {
    try {
      reader = createRowReader(headers, mapping, deviceId, { limits: readingLimits(), nowMs: Date.now() });
    } catch (error) {
      if (error instanceof CsvMappingError) throw new ValidationError(`The file does not have the chosen columns. ${error.message}`, error.fields);
      throw error;
    }
  };
  if (mapping.headerLine === 0) startReading(numberedHeaders(1000));

  const pendingCells: (readonly string[])[] = [];
  const flushStage = () => {
    const batch = stage.pending.slice();
    const earlier = stage.flush();
    for (let k = 0; k < batch.length; k++) {
      const reading = batch[k];
      const first = earlier ? earlier[k] : null;
      if (!first) {
        summary.readingCount++;
        if (summary.firstAtMs === null || reading.atMs < summary.firstAtMs) summary.firstAtMs = reading.atMs;
        if (summary.lastAtMs === null || reading.atMs > summary.lastAtMs) summary.lastAtMs = reading.atMs;
        if (summary.rows.length < PREVIEW_ROWS) {
          summary.rows.push({ line: reading.line, atMs: reading.atMs, tempC: reading.tempC, timeText: reader!.timeText(pendingCells[k]), temperatureText: reader!.temperatureText(pendingCells[k]) });
        }
      } else if (first.tempC !== reading.tempC) {
        addIssues([duplicateError(reading, first, reader!.timeColumn, reader!.timeText(pendingCells[k]))]);
      } else summary.repeatedInFile++;
    }
    pendingCells.length = 0;
  };

  // One short transaction per chunk of rows: synchronous, never across an await. Issues are
  // added in file order: the staged batch is flushed before a row's own problems are listed.
  const takeRecords = sqlite.transaction((records: { line: number; cells: string[] }[]) => {
    for (const record of records) {
      lastLine = record.line;
      if (!reader) {
        if (record.line < mapping.headerLine) continue;
        if (record.line > mapping.headerLine) {
          throw new ValidationError(`Line ${mapping.headerLine} is not the start of a row (it is blank, or inside a quoted value); choose the line that holds the column names.`, {
            headerLine: [`Line ${mapping.headerLine} does not start a row.`],
          });
        }
        if (isBlankRecord(record.cells)) throw new ValidationError(`Line ${mapping.headerLine} is blank; choose the line that holds the column names.`, { headerLine: [`Line ${mapping.headerLine} is blank.`] });
        startReading(record.cells.map((c) => c.trim()));
        continue;
      }
      if (isBlankRecord(record.cells)) continue;
      summary.rowCount++;
      rowErrors.length = 0;
      const reading = reader.read(record.cells, record.line, rowErrors);
      if (reading) {
        stage.pending.push(reading);
        pendingCells.push(record.cells);
        if (stage.pending.length === STAGE_BATCH) flushStage();
      } else {
        flushStage();
        addIssues(rowErrors);
      }
    }
    flushStage();
  });

  try {
    const records = new CsvRecordReader(mapping.delimiter);
    const decoder = new TextDecoder(meta.encoding);
    const stream = fs.createReadStream(csvPath, { highWaterMark: READ_CHUNK_BYTES });
    try {
      for await (const chunk of stream) {
        takeRecords(refuseOverLimits(() => records.push(decoder.decode(chunk as Buffer, { stream: true }))));
      }
      takeRecords(refuseOverLimits(() => [...records.push(decoder.decode()), ...records.end()]));
    } catch (error) {
      if (!(error instanceof CsvRecordError) || error instanceof CsvLimitError) throw error;
      addIssues([fileIssue(error.line, error.message)]);
    } finally {
      stream.destroy();
    }
    if (!reader) {
      throw new ValidationError(`The file has ${formatCount(lastLine)} lines; line ${mapping.headerLine} cannot be the header row.`, { headerLine: ["The file has no such line."] });
    }
    return summary;
  } catch (error) {
    stage.drop();
    throw error;
  }
}

function summaryOf(scan: Scan): CsvScanSummary {
  const { rowCount, readingCount, repeatedInFile, firstAtMs, lastAtMs, issues, issueCount, issueLineCount } = scan;
  return { rowCount, readingCount, repeatedInFile, firstAtMs, lastAtMs, issues, issueCount, issueLineCount };
}

function refuseEmpty(scan: CsvScanSummary): void {
  if (scan.rowCount === 0 && scan.issueCount === 0) {
    throw new ValidationError("The file has no rows of data below the header; there is nothing to import.", { file: ["The file has no rows of data."] });
  }
}

/** Reads the upload with this mapping; writes nothing. */
export async function previewCsvUpload(actor: SessionUser, sensorId: number, token: string, mapping: CsvMapping): Promise<CsvPreview> {
  const sensor = loadSensor(sensorId);
  const { meta, csvPath } = openUpload(actor, sensorId, token);
  const scan = await scanUpload(meta, csvPath, mapping, sensor.externalId);
  try {
    refuseEmpty(scan);
    const sqlite = getDb().$client;
    const stored = sqlite
      .prepare(`SELECT count(*) AS n, coalesce(sum(r.temp_c <> s.temp_c), 0) AS differing FROM temp.${scan.stage.name} s JOIN readings r ON r.sensor_id = ? AND r.at = s.at`)
      .get(sensorId) as { n: number; differing: number };
    const conflictRows = stored.differing
      ? (sqlite
          .prepare(
            `SELECT s.line, s.at AS atMs, s.temp_c AS tempC, r.temp_c AS storedTempC FROM temp.${scan.stage.name} s JOIN readings r ON r.sensor_id = ? AND r.at = s.at ` +
              `WHERE r.temp_c <> s.temp_c ORDER BY s.line LIMIT ${MAX_LISTED_ISSUES}`,
          )
          .all(sensorId) as CsvConflictRow[])
      : [];
    return { ...summaryOf(scan), rows: scan.rows, alreadyStored: stored.n, conflicts: stored.differing, conflictRows };
  } finally {
    scan.stage.drop();
  }
}

/**
 * Reads the upload again from scratch (never trusting an earlier preview) and, when no row has a
 * problem, stores every reading in one transaction; otherwise throws CsvImportRejectedError and
 * writes nothing. A successful import remembers the mapping and time zone on the sensor and
 * deletes the upload.
 */
export async function importCsvUpload(actor: SessionUser, sensorId: number, token: string, mapping: CsvMapping): Promise<CsvImportResult> {
  const sensor = loadSensor(sensorId);
  const { meta, csvPath } = openUpload(actor, sensorId, token);
  const scan = await scanUpload(meta, csvPath, mapping, sensor.externalId);
  let result: CsvImportResult;
  try {
    refuseEmpty(scan);
    if (scan.issueCount > 0) throw new CsvImportRejectedError(summaryOf(scan));
    const db = getDb();
    // The write gate: the request thread waits for this without blocking (lib/workers/write-gate.ts).
    result = holdingWriteGate(() =>
      db.transaction(
        (tx) => {
          const current = tx.select().from(sensors).where(eq(sensors.id, sensorId)).get();
          if (!current) throw new NotFoundError("That sensor");
          if (!current.active) throw new ConflictError(`Sensor ${current.externalId} was switched off meanwhile; nothing was imported.`);
          // WHERE true: SQLite's grammar needs it between SELECT … and ON CONFLICT.
          // Counted before the insert: afterwards every staged instant is stored.
          const { conflicts } = db.$client
            .prepare(`SELECT count(*) AS conflicts FROM temp.${scan.stage.name} s JOIN readings r ON r.sensor_id = ? AND r.at = s.at WHERE r.temp_c <> s.temp_c`)
            .get(sensorId) as { conflicts: number };
          const accepted = db.$client
            .prepare(`INSERT INTO readings (sensor_id, at, temp_c) SELECT ?, at, temp_c FROM temp.${scan.stage.name} WHERE true ORDER BY at ON CONFLICT (sensor_id, at) DO NOTHING`)
            .run(sensorId).changes;
          const alreadyStored = scan.readingCount - accepted;
          const duplicates = alreadyStored + scan.repeatedInFile;
          const remembered = toRememberedMapping(mapping);
          tx.update(sensors).set({ csvMapping: remembered, timeZone: mapping.timeZone, updatedAt: new Date() }).where(eq(sensors.id, sensorId)).run();
          // The staged minimum is at or before the earliest newly stored reading: detection from there finds the same.
          const excursions = accepted > 0 && scan.firstAtMs !== null ? refreshExcursions(tx, [sensorId], { sinceMs: scan.firstAtMs, notify: true }) : { opened: 0, closed: 0, updated: 0 };
          if (accepted > 0) reassessRooms(tx, roomsOfSensors(tx, [sensorId]), { reason: "uploaded temperature readings" });
          recordAudit(tx, actor, {
            action: "upload_readings",
            entityType: "sensor",
            entityId: sensorId,
            summary:
              `Uploaded ${formatCount(accepted)} reading${accepted === 1 ? "" : "s"} from ${meta.fileName} ` +
              `(${duplicates === 0 ? "no duplicates" : `${formatCount(duplicates)} duplicate${duplicates === 1 ? "" : "s"} not stored again`}` +
              `${conflicts === 0 ? "" : `, of which ${formatCount(conflicts)} differing from the stored reading, which was kept`})`,
            before: { csvMapping: current.csvMapping, timeZone: current.timeZone },
            after: {
              fileName: meta.fileName,
              sizeBytes: meta.sizeBytes,
              rowCount: scan.rowCount,
              accepted,
              duplicates,
              conflicts,
              firstAt: scan.firstAtMs === null ? null : new Date(scan.firstAtMs).toISOString(),
              lastAt: scan.lastAtMs === null ? null : new Date(scan.lastAtMs).toISOString(),
              csvMapping: remembered,
              timeZone: mapping.timeZone,
              excursions,
            },
          });
          return { accepted, duplicates, alreadyStored, conflicts, repeatedInFile: scan.repeatedInFile, rowCount: scan.rowCount, firstAtMs: scan.firstAtMs, lastAtMs: scan.lastAtMs, excursions };
        },
        { behavior: "immediate" },
      ),
    );
  } finally {
    scan.stage.drop();
  }
  removeUpload(token);
  return result;
}
