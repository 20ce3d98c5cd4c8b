import "server-only";
import fs from "node:fs";
import { DomainError, ValidationError } from "@/lib/errors";
import { MULTIPART_OVERHEAD_BYTES } from "@/lib/limits";

/**
 * Streams the file part of a multipart/form-data request (RFC 7578) to disk without holding the
 * body in memory: `request.formData()` would buffer the whole upload, which for a logger export of
 * up to 100 MB is too much. Only the first part named `field` with a filename is kept; other parts
 * are read past. The file is written with mode 0600 and removed again on any error. The whole body
 * is bounded too (the file's limit and MULTIPART_OVERHEAD_BYTES), so that other parts cannot make
 * it read on without end.
 */
export class UploadTooLargeError extends DomainError {
  constructor(maxBytes: number, what: string) {
    const limit = `${Math.round(maxBytes / (1024 * 1024))} MB`;
    super("file_too_large", `The file is larger than ${limit}; ${what}`, 413, { file: [`The file is larger than ${limit}.`] });
  }
}

const MAX_PART_HEADER_BYTES = 16 * 1024;

export type StreamedFile = { fileName: string; sizeBytes: number; firstBytes: Uint8Array };

function boundaryOf(contentType: string): string | null {
  if (!contentType.toLowerCase().startsWith("multipart/form-data")) return null;
  const match = /boundary=(?:"([^"]+)"|([^;\s]+))/i.exec(contentType);
  return match ? (match[1] ?? match[2]) : null;
}

function partHeaders(text: string): { name: string | null; fileName: string | null } {
  const disposition = text.split("\r\n").find((l) => /^content-disposition:/i.test(l)) ?? "";
  const name = /;\s*name="([^"]*)"/i.exec(disposition)?.[1] ?? null;
  const star = /;\s*filename\*=(?:UTF-8'[^']*')?([^;]+)/i.exec(disposition)?.[1];
  let fileName = /;\s*filename="([^"]*)"/i.exec(disposition)?.[1] ?? null;
  if (star) {
    try {
      fileName = decodeURIComponent(star.trim());
    } catch {
      /* keep the plain filename */
    }
  }
  return { name, fileName };
}

/**
 * Writes the part to `destPath`. Throws ValidationError (400) for a body that is not multipart or
 * has no such file part, UploadTooLargeError (413) past `maxBytes` (checked against the declared
 * Content-Length first, then while reading: the file part, and the body as a whole).
 */
export async function streamMultipartFile(
  request: Request,
  options: { field: string; maxBytes: number; destPath: string; tooLargeHint: string; missingMessage: string },
): Promise<StreamedFile> {
  const boundary = boundaryOf(request.headers.get("content-type") ?? "");
  if (!boundary || !request.body) throw new ValidationError(options.missingMessage, { [options.field]: [options.missingMessage] });
  const declared = Number(request.headers.get("content-length"));
  if (Number.isFinite(declared) && declared > options.maxBytes + MULTIPART_OVERHEAD_BYTES) throw new UploadTooLargeError(options.maxBytes, options.tooLargeHint);

  // Every boundary but the first is preceded by CRLF; starting the buffer with CRLF makes them all alike.
  const delimiter = Buffer.from(`\r\n--${boundary}`);
  let buffer: Buffer = Buffer.from("\r\n");
  type State = "preamble" | "afterBoundary" | "headers" | "body" | "done";
  let state = "preamble" as State;
  let keeping = false;
  let kept = false;
  let fileName = "";
  let sizeBytes = 0;
  let firstBytes = Buffer.alloc(0);
  let handle: fs.promises.FileHandle | null = null;
  const reader = request.body.getReader();
  const maxBodyBytes = options.maxBytes + MULTIPART_OVERHEAD_BYTES;
  let bodyBytes = 0;

  const write = async (bytes: Buffer) => {
    if (!keeping || bytes.length === 0) return;
    sizeBytes += bytes.length;
    if (sizeBytes > options.maxBytes) throw new UploadTooLargeError(options.maxBytes, options.tooLargeHint);
    if (firstBytes.length < 65_536) firstBytes = Buffer.concat([firstBytes, bytes.subarray(0, 65_536 - firstBytes.length)]);
    await handle!.write(bytes);
  };

  try {
    let ended = false;
    const finished = () => state === "done";
    while (!finished()) {
      let progressed = true;
      while (progressed && !finished()) {
        progressed = false;
        if (state === "preamble" || state === "body") {
          const at = buffer.indexOf(delimiter);
          if (at === -1) {
            // Keep what could be the start of a delimiter cut by the chunk boundary.
            const safe = Math.max(0, buffer.length - delimiter.length + 1);
            if (state === "body") await write(buffer.subarray(0, safe));
            buffer = buffer.subarray(safe);
            break;
          }
          if (state === "body") {
            await write(buffer.subarray(0, at));
            if (keeping) {
              keeping = false;
              kept = true;
            }
          }
          buffer = buffer.subarray(at + delimiter.length);
          state = "afterBoundary";
          progressed = true;
        } else if (state === "afterBoundary") {
          if (buffer.length < 2) break;
          if (buffer[0] === 0x2d && buffer[1] === 0x2d) {
            state = "done";
            break;
          }
          const lineEnd = buffer.indexOf("\r\n");
          if (lineEnd === -1) break;
          buffer = buffer.subarray(lineEnd + 2);
          state = "headers";
          progressed = true;
        } else if (state === "headers") {
          const end = buffer.indexOf("\r\n\r\n");
          if (end === -1) {
            if (buffer.length > MAX_PART_HEADER_BYTES) throw new ValidationError("The upload's part headers are too long.");
            break;
          }
          const { name, fileName: partFileName } = partHeaders(buffer.subarray(0, end).toString("utf8"));
          buffer = buffer.subarray(end + 4);
          if (!kept && name === options.field && partFileName !== null) {
            handle = await fs.promises.open(options.destPath, "wx", 0o600);
            keeping = true;
            fileName = partFileName;
          }
          state = "body";
          progressed = true;
        }
      }
      if (finished()) break;
      if (ended) throw new ValidationError("The upload ended before the file was complete; send it again.", { [options.field]: ["The upload was cut off."] });
      const { done, value } = await reader.read();
      if (done) ended = true;
      else if ((bodyBytes += value.byteLength) > maxBodyBytes) throw new UploadTooLargeError(options.maxBytes, options.tooLargeHint);
      else buffer = buffer.length ? Buffer.concat([buffer, Buffer.from(value.buffer, value.byteOffset, value.byteLength)]) : Buffer.from(value.buffer, value.byteOffset, value.byteLength);
    }
    await reader.cancel().catch(() => undefined);
    if (!kept) throw new ValidationError(options.missingMessage, { [options.field]: [options.missingMessage] });
    await handle!.sync();
    await handle!.close();
    handle = null;
    return { fileName, sizeBytes, firstBytes: new Uint8Array(firstBytes) };
  } catch (error) {
    await reader.cancel().catch(() => undefined);
    if (handle) await handle.close().catch(() => undefined);
    if (keeping || kept) await fs.promises.rm(options.destPath, { force: true });
    throw error;
  }
}
