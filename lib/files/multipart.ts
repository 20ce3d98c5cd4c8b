import "server-only";
import { z } from "zod";
import { fieldErrorsFrom } from "@/lib/auth/guard";
import { ValidationError } from "@/lib/errors";
import { BodyTooLargeError, readBodyBytes } from "@/lib/http/request-guard";
import { MULTIPART_OVERHEAD_BYTES, SDS_LIMITS } from "@/lib/limits";
import { FileTooLargeError } from "./errors";
import type { Upload } from "./storage";

const MAX_SDS_BYTES = SDS_LIMITS.fileBytes;

const sdsFormSchema = z.object({
  file: z.instanceof(File, { message: "Choose a PDF file to upload." }),
});

/**
 * The body within the limit (see `readBodyBytes`): an oversized upload is never held whole. What is
 * held stays within it: a sheet of at most 20 MB is kept in memory to be hashed and written in one go.
 */
async function readBodyWithin(request: Request, maxBytes: number): Promise<Uint8Array> {
  try {
    return await readBodyBytes(request, maxBytes);
  } catch (error) {
    if (error instanceof BodyTooLargeError) throw new FileTooLargeError(MAX_SDS_BYTES);
    throw error;
  }
}

/** The `file` field of a multipart/form-data request, as an upload for lib/files. */
export async function readSdsUpload(request: Request): Promise<Upload> {
  const contentType = request.headers.get("content-type") ?? "";
  if (!contentType.toLowerCase().startsWith("multipart/form-data")) {
    throw new ValidationError("Send the file as multipart/form-data in the field “file”.", { file: ["Choose a PDF file to upload."] });
  }
  const body = await readBodyWithin(request, MAX_SDS_BYTES + MULTIPART_OVERHEAD_BYTES);
  let form: FormData;
  try {
    form = await new Response(body as BodyInit, { headers: { "content-type": contentType } }).formData();
  } catch {
    throw new ValidationError("The upload could not be read as a form.", { file: ["Choose a PDF file to upload."] });
  }
  const parsed = sdsFormSchema.safeParse({ file: form.get("file") ?? undefined });
  if (!parsed.success) throw new ValidationError("Some fields need attention.", fieldErrorsFrom(parsed.error));
  const file = parsed.data.file;
  if (file.size > MAX_SDS_BYTES) throw new FileTooLargeError(MAX_SDS_BYTES);
  return { bytes: new Uint8Array(await file.arrayBuffer()), originalName: file.name, declaredType: file.type || null };
}
