import { NextResponse } from "next/server";
import { readSdsUpload } from "@/lib/files/multipart";
import { attachSdsToSubstance } from "@/lib/files/service";
import { requireId } from "@/lib/http/params";
import { route } from "@/lib/http/route";

/** Attaches a safety data sheet (multipart field "file", a PDF of at most 20 MB) to a library substance. */
export const POST = route({ action: "substances.write" }, async ({ request, params, user }) => {
  const id = requireId(params, "That substance");
  const upload = await readSdsUpload(request);
  return NextResponse.json({ data: attachSdsToSubstance(user, id, upload) }, { status: 201 });
});
