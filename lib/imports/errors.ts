import { DomainError } from "@/lib/errors";

export const IMPORT_FILE_ERROR_CODES = [
  "file_too_large",
  "too_many_rows",
  "unsupported_format",
  "not_utf8",
  "unreadable_file",
  "uncalculated_formulas",
  "malformed_csv",
  "no_header_row",
  "blank_header",
  "duplicate_headers",
  "missing_columns",
] as const;
export type ImportFileErrorCode = (typeof IMPORT_FILE_ERROR_CODES)[number];

/**
 * A problem with the file as a whole, found before any row is read: the file cannot be imported at
 * all until it is fixed. Problems with single cells are reported as issues instead.
 */
export class ImportFileError extends DomainError {
  declare readonly code: ImportFileErrorCode;

  constructor(
    code: ImportFileErrorCode,
    message: string,
    /** Column names the message is about (missing or duplicated), for the page to list. */
    readonly columns: readonly string[] = [],
  ) {
    super(code, message, code === "file_too_large" ? 413 : 400);
  }
}
