/**
 * Errors across the thread boundary. Structured cloning keeps an Error's message but not its class
 * or its own properties, so a task's error is sent as a plain record (the class's key in the table
 * below, message, stack and every own property: code, status, fields, issues, rows, summary, …) and
 * rebuilt in the main thread as an instance of the same class, so `instanceof` checks and
 * `errorResponse` answer exactly as if the task had run there.
 *
 * Keys are written out rather than taken from `constructor.name`: bundlers may rename classes.
 * A class missing here arrives as its nearest listed ancestor (DomainError at least), with its
 * code, status and message intact.
 */
import { ExportCancelledError } from "@/lib/exports/table-sheet";
import { FileTooLargeError } from "@/lib/files/errors";
import { UploadTooLargeError } from "@/lib/files/multipart-stream";
import { ImportFileError } from "@/lib/imports/errors";
import { ImportRejectedError } from "@/lib/imports/service";
import { CsvImportRejectedError } from "@/lib/temperatures/csv-upload";
import { BatchRejectedError } from "@/lib/temperatures/ingest";
import {
  ConflictError,
  DomainError,
  ForbiddenError,
  InvalidCredentialsError,
  NotFoundError,
  RateLimitedError,
  UnauthenticatedError,
  ValidationError,
} from "@/lib/errors";

type ErrorClass = abstract new (...args: never[]) => Error;

/** Subclasses before their parents: the first class an error is an instance of names it. */
const ERROR_CLASSES: [key: string, type: ErrorClass][] = [
  ["ImportRejectedError", ImportRejectedError],
  ["ImportFileError", ImportFileError],
  ["CsvImportRejectedError", CsvImportRejectedError],
  ["BatchRejectedError", BatchRejectedError],
  ["UploadTooLargeError", UploadTooLargeError],
  ["FileTooLargeError", FileTooLargeError],
  ["ValidationError", ValidationError],
  ["UnauthenticatedError", UnauthenticatedError],
  ["InvalidCredentialsError", InvalidCredentialsError],
  ["ForbiddenError", ForbiddenError],
  ["NotFoundError", NotFoundError],
  ["ConflictError", ConflictError],
  ["RateLimitedError", RateLimitedError],
  ["DomainError", DomainError],
  ["ExportCancelledError", ExportCancelledError],
];

/** An error as it crosses from a worker to the main thread. */
export type SerializedError = {
  /** The key of its class in ERROR_CLASSES; null for any other error. */
  key: string | null;
  name: string;
  message: string;
  stack?: string;
  /** Own properties (code, status, fields, issues, …), structured-cloneable. */
  props: Record<string, unknown>;
};

function cloneable(props: Record<string, unknown>): Record<string, unknown> {
  const kept: Record<string, unknown> = {};
  for (const [name, value] of Object.entries(props)) {
    try {
      structuredClone(value);
      kept[name] = value;
    } catch {
      // A property that cannot cross threads (a function, a handle) is left behind.
    }
  }
  return kept;
}

export function serializeError(error: unknown): SerializedError {
  if (!(error instanceof Error)) return { key: null, name: "Error", message: String(error), props: {} };
  const key = ERROR_CLASSES.find(([, type]) => error instanceof type)?.[0] ?? null;
  const { name: _name, message: _message, stack: _stack, ...own } = Object.fromEntries(Object.entries(error));
  return { key, name: error.name, message: error.message, stack: error.stack, props: cloneable(own) };
}

/** The error again, as an instance of its class in this thread (never by calling its constructor). */
export function reviveError(record: SerializedError, context: string): Error {
  const type = record.key ? ERROR_CLASSES.find(([key]) => key === record.key)?.[1] : undefined;
  const error = new Error(record.message);
  if (type) Object.setPrototypeOf(error, type.prototype);
  Object.assign(error, record.props);
  Object.defineProperty(error, "name", { value: record.name, enumerable: false, writable: true, configurable: true });
  error.stack = `${record.stack ?? `${record.name}: ${record.message}`}\n    at ${context}`;
  return error;
}
