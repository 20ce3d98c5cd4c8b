import { NextResponse } from "next/server";
import { route } from "@/lib/http/route";
import { ImportRejectedError, withImportUpload } from "@/lib/imports/service";
import { limit } from "@/lib/rate-limit";
import { runTask } from "@/lib/workers/pool";

/** Imports containers from the multipart field `file`: every row is written, or none (in a worker thread). */
export const POST = route({ action: "containers.import" }, async ({ request, user }) => {
  await limit("importUser", user.id);
  return withImportUpload(request, async (file) => {
    try {
      return NextResponse.json({ data: await runTask("imports.commitContainers", { actor: user, file: { path: file.path, fileName: file.fileName } }) }, { status: 201 });
    } catch (error) {
      if (error instanceof ImportRejectedError) {
        return NextResponse.json({ error: { code: error.code, message: error.message, issues: error.issues } }, { status: 400 });
      }
      throw error;
    }
  });
});
