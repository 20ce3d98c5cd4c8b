import { NextResponse } from "next/server";
import { readSdsUpload } from "@/lib/files/multipart";
import { attachSdsToContainer } from "@/lib/files/service";
import { requireId } from "@/lib/http/params";
import { route } from "@/lib/http/route";

/**
 * Attaches a safety data sheet (multipart field "file", a PDF of at most 20 MB) to a container.
 * Researchers may attach only to their own containers (403 otherwise, nothing stored).
 */
export const POST = route({ action: "files.upload" }, async ({ request, params, user, scope }) => {
  const id = requireId(params, "That container");
  const upload = await readSdsUpload(request);
  return NextResponse.json({ data: attachSdsToContainer(user, scope, id, upload) }, { status: 201 });
});
