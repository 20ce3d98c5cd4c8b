/**
 * Checks on an uploaded safety data sheet that need no disk and no database: size, type by
 * content, and a display name that is safe to show and to send back in a header.
 */
import { ValidationError } from "@/lib/errors";
import { SDS_LIMITS } from "@/lib/limits";
import { FileTooLargeError } from "./errors";

/** 20 MB (`SDS_LIMITS.fileBytes`): a scanned safety data sheet of a dozen pages fits comfortably. */
export const MAX_SDS_BYTES = SDS_LIMITS.fileBytes;

export const MAX_FILE_NAME_LENGTH = 200;

export const PDF_CONTENT_TYPE = "application/pdf";

/** Every PDF begins with the header "%PDF-" followed by the version (ISO 32000-1:2008, 7.5.2). */
const PDF_MAGIC = [0x25, 0x50, 0x44, 0x46, 0x2d];

/** Whether the bytes start like a PDF. The declared type and the extension are not consulted. */
export function looksLikePdf(bytes: Uint8Array): boolean {
  if (bytes.length < PDF_MAGIC.length) return false;
  return PDF_MAGIC.every((byte, index) => bytes[index] === byte);
}

/**
 * The name to show for an upload: the last path segment only, without control or bidi-override
 * characters, whitespace collapsed, at most 200 characters with the extension kept.
 */
export function sanitiseFileName(raw: string | null | undefined): string {
  const lastSegment = String(raw ?? "").split(/[\\/]/).pop() ?? "";
  const cleaned = lastSegment
    .normalize("NFC")
    // C0 and C1 controls, and the Unicode format characters that reorder or hide text.
    .replace(/[\u0000-\u001f\u007f-\u009f\u200b-\u200f\u202a-\u202e\u2066-\u2069\ufeff]/g, "")
    .replace(/\s+/g, " ")
    .trim()
    .replace(/^\.+/, "");
  const name = cleaned || "safety-data-sheet.pdf";
  if (name.length <= MAX_FILE_NAME_LENGTH) return name;
  const dot = name.lastIndexOf(".");
  const extension = dot > 0 && name.length - dot <= 10 ? name.slice(dot) : "";
  const budget = MAX_FILE_NAME_LENGTH - extension.length;
  // Cut by code point so a surrogate pair is never split.
  let stem = "";
  for (const ch of name.slice(0, name.length - extension.length)) {
    if (stem.length + ch.length > budget) break;
    stem += ch;
  }
  return stem.trimEnd() + extension;
}

/** Refuses an empty, oversized or non-PDF upload with the message the person sees. */
export function checkSdsBytes(bytes: Uint8Array): void {
  if (bytes.length === 0) throw new ValidationError("The file is empty.", { file: ["The file is empty."] });
  if (bytes.length > MAX_SDS_BYTES) throw new FileTooLargeError(MAX_SDS_BYTES);
  if (!looksLikePdf(bytes)) throw new ValidationError("This file is not a PDF.", { file: ["This file is not a PDF."] });
}

/**
 * A Content-Disposition value for showing the file in the browser: an ASCII fallback for old
 * clients and the exact name as RFC 5987 / RFC 6266 `filename*=UTF-8''…`.
 */
export function inlineDisposition(name: string): string {
  const fallback = name.replace(/[^\x20-\x7e]/g, "_").replace(/["\\%]/g, "_");
  const encoded = encodeURIComponent(name).replace(/['()*]/g, (ch) => `%${ch.charCodeAt(0).toString(16).toUpperCase()}`);
  return `inline; filename="${fallback}"; filename*=UTF-8''${encoded}`;
}
