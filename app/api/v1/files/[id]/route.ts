import fs from "node:fs";
import { Readable } from "node:stream";
import { NotFoundError } from "@/lib/errors";
import { readFileForUser } from "@/lib/files/service";
import { inlineDisposition } from "@/lib/files/validate";
import { requireId } from "@/lib/http/params";
import { route } from "@/lib/http/route";
import { log } from "@/lib/log";

/**
 * Streams a stored safety data sheet. Every signed-in role passes the wrapper; readFileForUser
 * then decides by what the file is attached to. The headers keep the browser from sniffing,
 * caching or running anything from it.
 */
export const GET = route({ action: "overview.read" }, ({ params, user }) => {
  const file = readFileForUser(user, requireId(params, "That file"));
  let sizeBytes: number;
  try {
    sizeBytes = fs.statSync(file.path).size;
  } catch (error) {
    log.error({ err: error, path: file.path }, "a stored file is missing from the upload directory");
    throw new NotFoundError("That file");
  }
  const body = Readable.toWeb(fs.createReadStream(file.path)) as ReadableStream<Uint8Array>;
  return new Response(body, {
    status: 200,
    headers: {
      "Content-Type": "application/pdf",
      "Content-Length": String(sizeBytes),
      "Content-Disposition": inlineDisposition(file.originalName),
      "X-Content-Type-Options": "nosniff",
      "Cache-Control": "private, no-store",
      "Content-Security-Policy": "sandbox",
    },
  });
});
