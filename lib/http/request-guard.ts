import "server-only";
import { appUrl, isProduction } from "@/lib/config";
import { isSameOriginRequest, isStateChanging } from "./origin";
import { DomainError, ValidationError } from "@/lib/errors";
import { JSON_BODY_LIMITS } from "@/lib/limits";

/** A write sent by a page of another origin: refused before anything is read or written. */
export class CrossSiteRequestError extends DomainError {
  constructor() {
    super(
      "cross_site_request",
      "This request came from a page outside Headroom, so it was refused. Open Headroom at its own address and try again.",
      403,
    );
  }
}

export class BodyTooLargeError extends DomainError {
  constructor(limitBytes: number) {
    super("body_too_large", `The request body is larger than this endpoint accepts (${formatBytes(limitBytes)}).`, 413);
  }
}

export class UnsupportedMediaTypeError extends DomainError {
  constructor() {
    super("unsupported_media_type", "Send the request body as JSON with the header Content-Type: application/json.", 415);
  }
}

function formatBytes(bytes: number): string {
  if (bytes >= 1024 * 1024) return `${+(bytes / (1024 * 1024)).toFixed(1)} MB`;
  return `${Math.ceil(bytes / 1024)} KB`;
}

/** Throws unless a state-changing request comes from the app's own pages (safe methods pass). */
export function assertSameOrigin(request: Request): void {
  if (isStateChanging(request.method) && !isSameOriginRequest(request.headers, appUrl(), isProduction())) throw new CrossSiteRequestError();
}

function isJsonContentType(value: string | null): boolean {
  if (!value) return false;
  const type = value.split(";")[0].trim().toLowerCase();
  return type === "application/json" || (type.startsWith("application/") && type.endsWith("+json"));
}

/**
 * Reads the body as bytes, refusing it (413) as soon as it passes `maxBytes` — at once when
 * Content-Length says so, otherwise while it streams — so an oversized body is never held whole.
 */
export async function readBodyBytes(request: Request, maxBytes: number): Promise<Uint8Array> {
  const declared = Number(request.headers.get("content-length"));
  if (Number.isFinite(declared) && declared > maxBytes) throw new BodyTooLargeError(maxBytes);
  if (!request.body) return new Uint8Array();
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > maxBytes) {
      await reader.cancel().catch(() => undefined);
      throw new BodyTooLargeError(maxBytes);
    }
    chunks.push(value);
  }
  if (chunks.length === 1) return chunks[0];
  const body = new Uint8Array(total);
  let offset = 0;
  for (const chunk of chunks) {
    body.set(chunk, offset);
    offset += chunk.byteLength;
  }
  return body;
}

const utf8 = new TextDecoder("utf-8", { fatal: true });

/**
 * A JSON request body: within the size limit (413), declared as JSON when it is not empty (415),
 * valid UTF-8 (400, never stored as replacement characters) and valid JSON (400). An empty body
 * reads as `{}`.
 */
export async function readJsonBody(request: Request, maxBytes: number = JSON_BODY_LIMITS.defaultBytes): Promise<unknown> {
  const declared = Number(request.headers.get("content-length"));
  if (declared === 0 && !request.headers.get("content-type")) return {};
  const bytes = await readBodyBytes(request, maxBytes);
  let text: string;
  try {
    text = utf8.decode(bytes);
  } catch {
    throw new ValidationError("The request body is not valid UTF-8 text.");
  }
  if (!text.trim()) return {};
  if (!isJsonContentType(request.headers.get("content-type"))) throw new UnsupportedMediaTypeError();
  try {
    return JSON.parse(text);
  } catch {
    throw new ValidationError("The request body is not valid JSON.");
  }
}
