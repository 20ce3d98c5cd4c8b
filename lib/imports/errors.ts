import { DomainError } from "@/lib/errors";

export const IMPORT_FILE_ERROR_CODES = [
  "file_too_large",
  "entry_too_large",
  "zip_bomb",
  "too_many_rows",
  "too_many_columns",
  "cell_too_long",
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

/** Over a size limit (the upload, or what a workbook unpacks to): 413. Every other file problem: 400. */
const TOO_LARGE: readonly ImportFileErrorCode[] = ["file_too_large", "entry_too_large"];

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
    super(code, message, TOO_LARGE.includes(code) ? 413 : 400);
  }
}
