/**
 * Imports from start to end: the upload streamed to a temporary file (bounded), the file read
 * within the limits, the lookups loaded once, every row checked, compared with the database, and
 * (on commit) everything written in one transaction or nothing at all. A commit checks the file
 * again from scratch; it never trusts an earlier preview.
 */
import "server-only";
import { randomBytes } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { reassessRooms, roomsOfUnits } from "@/lib/assessment/service";
import { getDb } from "@/db/client";
import type { SessionUser } from "@/lib/auth/session";
import { uploadDir } from "@/lib/config";
import { DomainError, ValidationError } from "@/lib/errors";
import { streamMultipartFile, UploadTooLargeError } from "@/lib/files/multipart-stream";
import { IMPORT_LIMITS, MULTIPART_OVERHEAD_BYTES } from "@/lib/limits";
import { log } from "@/lib/log";
import type { ImportIssue } from "./columns";
import { validateContainerRows } from "./containers";
import { ImportFileError } from "./errors";
import { validateLocationRows } from "./locations";
import { loadContainerLookups, loadLocationLookups } from "./lookups";
import { parseTabular, type ParsedTable } from "./parse";
import {
  locationPlanCounts,
  planContainerImport,
  planLocationImport,
  writeContainerPlan,
  writeLocationPlan,
  type ContainerImportCounts,
  type LocationCounts,
} from "./write";
import { holdingWriteGate } from "@/lib/workers/write-gate";

/** Refused because of problems in single cells; carries every one of them for the page to list. */
export class ImportRejectedError extends DomainError {
  constructor(
    readonly issues: ImportIssue[],
    rowCount: number,
  ) {
    const lines = new Set(issues.map((i) => i.line)).size;
    super(
      "import_rejected",
      `Nothing was imported: ${issues.length === 1 ? "1 problem" : `${issues.length} problems`} on ` +
        `${lines === 1 ? "1 row" : `${lines} rows`} of ${rowCount}. Fix them in the file and import it again.`,
      400,
    );
  }
}

export type ImportPreview<Counts> = {
  rowCount: number;
  issues: ImportIssue[];
  toCreate: Counts;
  toUpdate: Counts;
  unchanged: Counts;
  notices: string[];
};

export type ContainerImportPreview = ImportPreview<number>;
export type LocationImportPreview = ImportPreview<LocationCounts>;
export type LocationImportResult = { created: LocationCounts; updated: LocationCounts; unchanged: LocationCounts };

function allIssues(...lists: ImportIssue[][]): ImportIssue[] {
  // Stable: within a line the validator's column order is kept.
  return lists.flat().sort((a, b) => a.line - b.line);
}

function refuseEmpty(rowCount: number): void {
  if (rowCount === 0) {
    throw new ValidationError("The file has a header row but no rows of data; there is nothing to import.", {
      file: ["The file has a header row but no rows of data; there is nothing to import."],
    });
  }
}

const EMPTY_NOTICE = "The file has a header row but no rows of data; there is nothing to import.";

/**
 * A file to import: on disk (an upload streamed to a temporary file, or a file a script or a
 * worker thread is handed) or in memory. `fileName` is the name the person knows it by.
 */
export type ImportFile = { fileName: string } & ({ path: string } | { bytes: Uint8Array });

function readImportFile(file: ImportFile): Promise<ParsedTable> {
  return parseTabular("path" in file ? { path: file.path } : { bytes: file.bytes }, file.fileName);
}

// ----- containers ------------------------------------------------------------------------------

export async function previewContainerImport(file: ImportFile): Promise<ContainerImportPreview> {
  const table = await readImportFile(file);
  return getDb().transaction((tx) => {
    const validation = validateContainerRows(table, loadContainerLookups(tx));
    const plan = planContainerImport(tx, validation.rows);
    return {
      rowCount: validation.rowCount,
      issues: allIssues(validation.issues, plan.issues),
      toCreate: plan.creates.length,
      toUpdate: plan.updates.length,
      unchanged: plan.unchanged,
      notices: validation.rowCount === 0 ? [...validation.notices, EMPTY_NOTICE] : validation.notices,
    };
  });
}

export async function commitContainerImport(actor: SessionUser, file: ImportFile): Promise<ContainerImportCounts> {
  const { fileName } = file;
  const table = await readImportFile(file);
  refuseEmpty(table.rows.length);
  // Immediate: the write lock is taken before the lookups are read, so nothing changes in between.
  const db = getDb();
  // The write gate: the request thread waits for this without blocking (lib/workers/write-gate.ts).
  return holdingWriteGate(() =>
    db.transaction(
      (tx) => {
        const validation = validateContainerRows(table, loadContainerLookups(tx));
        const plan = planContainerImport(tx, validation.rows);
        const issues = allIssues(validation.issues, plan.issues);
        if (issues.length > 0) throw new ImportRejectedError(issues, validation.rowCount);
        const counts = writeContainerPlan(tx, db.$client, actor, plan, fileName);
        const unitIds = [...plan.creates.map((row) => row.storageUnitId), ...plan.updates.flatMap((u) => [u.fromStorageUnitId, u.set.storageUnitId])];
        reassessRooms(tx, roomsOfUnits(tx, unitIds), { reason: `import of ${fileName}` });
        return counts;
      },
      { behavior: "immediate" },
    ),
  );
}

// ----- locations -------------------------------------------------------------------------------

export async function previewLocationImport(file: ImportFile): Promise<LocationImportPreview> {
  const table = await readImportFile(file);
  return getDb().transaction((tx) => {
    const validation = validateLocationRows(table, loadLocationLookups(tx));
    const plan = planLocationImport(tx, validation, table);
    const counts = locationPlanCounts(plan);
    return {
      rowCount: validation.rowCount,
      issues: allIssues(validation.issues, plan.issues),
      toCreate: counts.created,
      toUpdate: counts.updated,
      unchanged: counts.unchanged,
      notices: validation.rowCount === 0 ? [...validation.notices, EMPTY_NOTICE] : validation.notices,
    };
  });
}

export async function commitLocationImport(actor: SessionUser, file: ImportFile): Promise<LocationImportResult> {
  const { fileName } = file;
  const table = await readImportFile(file);
  refuseEmpty(table.rows.length);
  return holdingWriteGate(() =>
    getDb().transaction(
      (tx) => {
        const validation = validateLocationRows(table, loadLocationLookups(tx));
        const plan = planLocationImport(tx, validation, table);
        const issues = allIssues(validation.issues, plan.issues);
        if (issues.length > 0) throw new ImportRejectedError(issues, validation.rowCount);
        return writeLocationPlan(tx, actor, plan, fileName);
      },
      { behavior: "immediate" },
    ),
  );
}

// ----- the upload ------------------------------------------------------------------------------

const FILE_NAME_MAX_LENGTH = 200;
/** Temporary files older than this are left over from a process that stopped mid-import. */
const LEFTOVER_AGE_MS = 60 * 60 * 1000;

const NOT_MULTIPART = "Send the file as multipart/form-data, in the form field “file”.";
const NO_FILE = "Choose a CSV or XLSX file to import.";
const EMPTY_FILE = "The chosen file is empty; choose the spreadsheet to import.";

/** Where uploads wait while they are read: beside the stored files, never under public/. */
export function importUploadDir(): string {
  return path.join(uploadDir(), "import-uploads");
}

function removeLeftovers(dir: string): void {
  const now = Date.now();
  for (const name of fs.readdirSync(dir)) {
    const file = path.join(dir, name);
    try {
      if (now - fs.statSync(file).mtimeMs > LEFTOVER_AGE_MS) fs.rmSync(file, { force: true });
    } catch {
      // Removed meanwhile by another request.
    }
  }
}

function uploadTooLarge(message: string): ImportFileError {
  return new ImportFileError("file_too_large", message);
}

/**
 * Streams the multipart form field `file` of an upload to a temporary file (mode 0600), refusing
 * it (413) at once when Content-Length says it is too large and otherwise at the first byte past
 * the limit, so an upload is never held in memory. Runs `work` with the file, then deletes it,
 * whatever happens.
 */
export async function withImportUpload<T>(request: Request, work: (file: { path: string; fileName: string }) => Promise<T>): Promise<T> {
  const upload = await readImportUpload(request);
  try {
    return await work(upload);
  } finally {
    await upload.remove();
  }
}

export type ImportUpload = { path: string; fileName: string; sizeBytes: number; remove: () => Promise<void> };

/** The upload on disk; the caller must call `remove()` (use `withImportUpload`, which does). */
export async function readImportUpload(request: Request): Promise<ImportUpload> {
  const limitMb = Math.round(IMPORT_LIMITS.fileBytes / (1024 * 1024));
  const declared = Number(request.headers.get("content-length"));
  if (Number.isFinite(declared) && declared > IMPORT_LIMITS.fileBytes + MULTIPART_OVERHEAD_BYTES) {
    const mb = (declared / (1024 * 1024)).toFixed(1);
    throw uploadTooLarge(`The file is about ${mb} MB; imports take files up to ${limitMb} MB. Split it into smaller files.`);
  }
  if (!(request.headers.get("content-type") ?? "").toLowerCase().startsWith("multipart/form-data")) {
    throw new ValidationError(NOT_MULTIPART, { file: [NOT_MULTIPART] });
  }
  const dir = importUploadDir();
  fs.mkdirSync(dir, { recursive: true, mode: 0o700 });
  removeLeftovers(dir);
  const filePath = path.join(dir, `${randomBytes(16).toString("hex")}.upload`);
  const remove = () => fs.promises.rm(filePath, { force: true }).catch((error: unknown) => log.error({ err: error }, "could not remove an import upload"));
  let streamed: Awaited<ReturnType<typeof streamMultipartFile>>;
  try {
    streamed = await streamMultipartFile(request, {
      field: "file",
      maxBytes: IMPORT_LIMITS.fileBytes,
      destPath: filePath,
      tooLargeHint: "",
      missingMessage: NO_FILE,
    });
  } catch (error) {
    await remove();
    if (error instanceof UploadTooLargeError) {
      throw uploadTooLarge(`The file is larger than ${limitMb} MB; imports take files up to ${limitMb} MB. Split it into smaller files.`);
    }
    throw error;
  }
  if (streamed.sizeBytes === 0) {
    await remove();
    throw new ValidationError(EMPTY_FILE, { file: [EMPTY_FILE] });
  }
  const baseName = streamed.fileName.split(/[\\/]/).pop()?.trim() || "upload";
  return { path: filePath, fileName: baseName.slice(0, FILE_NAME_MAX_LENGTH), sizeBytes: streamed.sizeBytes, remove };
}
