import { NextResponse } from "next/server";
import { route } from "@/lib/http/route";
import { ImportRejectedError, readImportUpload } from "@/lib/imports/service";
import { runTask, transferable } from "@/lib/workers/pool";

/** Imports sites, rooms and storage units from the multipart field `file`: every row is written, or none (in a worker thread). */
export const POST = route({ action: "locations.import" }, async ({ request, user }) => {
  const { bytes, fileName } = await readImportUpload(request);
  try {
    return NextResponse.json({ data: await runTask("imports.commitLocations", { actor: user, bytes, fileName }, { transferList: transferable(bytes) }) }, { status: 201 });
  } catch (error) {
    if (error instanceof ImportRejectedError) {
      return NextResponse.json({ error: { code: error.code, message: error.message, issues: error.issues } }, { status: 400 });
    }
    throw error;
  }
});
