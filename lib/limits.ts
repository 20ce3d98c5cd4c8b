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
