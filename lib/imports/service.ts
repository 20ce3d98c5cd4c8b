/**
 * Imports from start to end: read the file, load the lookups once, check every row, compare with
 * the database, and (on commit) write everything in one transaction or nothing at all. A commit
 * checks the file again from scratch; it never trusts an earlier preview.
 */
import "server-only";
import { reassessRooms, roomsOfUnits } from "@/lib/assessment/service";
import { z } from "zod";
import { getDb } from "@/db/client";
import { fieldErrorsFrom } from "@/lib/auth/guard";
import type { SessionUser } from "@/lib/auth/session";
import { DomainError, ValidationError } from "@/lib/errors";
import type { ImportIssue } from "./columns";
import { validateContainerRows } from "./containers";
import { ImportFileError } from "./errors";
import { validateLocationRows } from "./locations";
import { loadContainerLookups, loadLocationLookups } from "./lookups";
import { MAX_FILE_BYTES, parseTabularFile } from "./parse";
import {
  locationPlanCounts,
  planContainerImport,
  planLocationImport,
  writeContainerPlan,
  writeLocationPlan,
  type ContainerImportCounts,
  type LocationCounts,
} from "./write";

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

// ----- containers ------------------------------------------------------------------------------

export async function previewContainerImport(bytes: Uint8Array, fileName: string): Promise<ContainerImportPreview> {
  const table = await parseTabularFile(bytes, fileName);
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

export async function commitContainerImport(actor: SessionUser, bytes: Uint8Array, fileName: string): Promise<ContainerImportCounts> {
  const table = await parseTabularFile(bytes, fileName);
  refuseEmpty(table.rows.length);
  // Immediate: the write lock is taken before the lookups are read, so nothing changes in between.
  const db = getDb();
  return db.transaction(
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
  );
}

// ----- locations -------------------------------------------------------------------------------

export async function previewLocationImport(bytes: Uint8Array, fileName: string): Promise<LocationImportPreview> {
  const table = await parseTabularFile(bytes, fileName);
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

export async function commitLocationImport(actor: SessionUser, bytes: Uint8Array, fileName: string): Promise<LocationImportResult> {
  const table = await parseTabularFile(bytes, fileName);
  refuseEmpty(table.rows.length);
  return getDb().transaction(
    (tx) => {
      const validation = validateLocationRows(table, loadLocationLookups(tx));
      const plan = planLocationImport(tx, validation, table);
      const issues = allIssues(validation.issues, plan.issues);
      if (issues.length > 0) throw new ImportRejectedError(issues, validation.rowCount);
      return writeLocationPlan(tx, actor, plan, fileName);
    },
    { behavior: "immediate" },
  );
}

// ----- the upload ------------------------------------------------------------------------------

const FILE_NAME_MAX_LENGTH = 200;

const uploadSchema = z.object({
  file: z
    .instanceof(File, { message: "Choose a CSV or XLSX file to import." })
    .refine((file) => file.size > 0, { message: "The chosen file is empty; choose the spreadsheet to import." }),
});

/** Multipart headers and boundaries add a little to the file itself. */
const MULTIPART_OVERHEAD_BYTES = 64 * 1024;

/**
 * Reads the multipart form field `file` of an upload. The size is checked from the request's
 * Content-Length first, so a huge upload is refused before it is read into memory.
 */
export async function readImportUpload(request: Request): Promise<{ bytes: Uint8Array; fileName: string }> {
  const length = Number(request.headers.get("content-length") ?? "0");
  if (length > MAX_FILE_BYTES + MULTIPART_OVERHEAD_BYTES) {
    const mb = (length / (1024 * 1024)).toFixed(1);
    throw new ImportFileError("file_too_large", `The file is about ${mb} MB; imports take files up to 10 MB. Split it into smaller files.`);
  }
  let form: FormData;
  try {
    form = await request.formData();
  } catch {
    throw new ValidationError("Send the file as multipart/form-data, in the form field “file”.", {
      file: ["Send the file as multipart/form-data, in the form field “file”."],
    });
  }
  const parsed = uploadSchema.safeParse({ file: form.get("file") ?? undefined });
  if (!parsed.success) {
    const fields = fieldErrorsFrom(parsed.error);
    throw new ValidationError(fields.file?.[0] ?? "Choose a CSV or XLSX file to import.", fields);
  }
  const { file } = parsed.data;
  const baseName = file.name.split(/[\\/]/).pop()?.trim() || "upload";
  return {
    bytes: new Uint8Array(await file.arrayBuffer()),
    fileName: baseName.slice(0, FILE_NAME_MAX_LENGTH),
  };
}
