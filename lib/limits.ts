/**
 * Every limit on what the server accepts from outside — request bodies, uploads, imports — in one
 * place, so that the README's table and the checks cannot drift apart. Sizes are bytes.
 * Pure constants: safe to import from route handlers, services, workers and tests.
 */

const MiB = 1024 * 1024;

/** JSON request bodies: over the limit → 413 before the body is parsed. */
export const JSON_BODY_LIMITS = {
  /** Every JSON write unless its route says otherwise. */
  defaultBytes: 1 * MiB,
  /** `POST /api/v1/readings`: 10,000 readings of about 80 bytes each, with room for whitespace. */
  readingsBatchBytes: 4 * MiB,
} as const;

/**
 * Logger CSV uploads (`/temperatures/upload`). The file is streamed to disk under `maxUploadBytes`
 * (413 beyond); while it is read, a row longer than `maxRowChars` characters or with more than
 * `maxColumns` cells is refused (400 naming the line), so that no single row — a 100 MB line without
 * a line break, an unclosed quote — is ever held in memory. Logger rows are some tens of characters.
 */
export const LOGGER_CSV_LIMITS = {
  maxUploadBytes: 100 * MiB,
  /** Characters of one row (record), line breaks inside quoted values included. */
  maxRowChars: 32 * 1024,
  /** Cells of one row, and columns of the header. */
  maxColumns: 1000,
} as const;

/**
 * Room for the multipart boundaries and part headers around an uploaded file: a multipart body
 * may be this much larger than the file's own limit before it is refused.
 */
export const MULTIPART_OVERHEAD_BYTES = 64 * 1024;

/** Container and location import files (CSV or XLSX), whatever their format. */
export const IMPORT_LIMITS = {
  /** The uploaded file as sent: over it → 413 `file_too_large`, refused while the upload streams. */
  fileBytes: 10 * MiB,
  /** Data rows (blank rows and the header not counted): over it → 400 `too_many_rows`, reading stops there. */
  dataRows: 100_000,
  /** The last column that may hold a value: a value beyond it → 400 `too_many_columns`. */
  columns: 200,
  /** Characters in one cell, the most a spreadsheet cell holds: over it → 400 `cell_too_long`. */
  cellChars: 32_767,
} as const;

/**
 * An XLSX workbook is a zip archive: these bound what its parts unpack to. Checked from the zip's
 * central directory before anything is unpacked, and again on the bytes actually inflated.
 */
export const XLSX_LIMITS = {
  /** One part (a worksheet, the shared strings) unpacked: over it → 413 `entry_too_large`. */
  entryBytes: 100 * MiB,
  /** All parts together unpacked: over it → 413 `entry_too_large`. */
  totalBytes: 200 * MiB,
  /** Unpacked ÷ packed size of one part, once it passes `ratioFromBytes`: over it → 400 `zip_bomb`. */
  compressionRatio: 100,
  /** Parts smaller than this unpacked are not held to the ratio (small, repetitive XML packs tightly). */
  ratioFromBytes: 4 * MiB,
  /** Parts (files) in the archive: over it → 400 `zip_bomb`. A workbook has a dozen or a few hundred. */
  entries: 10_000,
  /** The workbook's own description (workbook.xml, relationships, styles) unpacked: over it → 413 `entry_too_large`. */
  metadataBytes: 8 * MiB,
} as const;

/** Safety data sheets (PDF) attached to containers and substances. */
export const SDS_LIMITS = {
  /** The PDF itself (a scanned sheet of a dozen pages fits): over it → 413 `file_too_large`, refused while the upload streams. */
  fileBytes: 20 * MiB,
} as const;
