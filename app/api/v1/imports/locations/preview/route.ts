import { NextResponse } from "next/server";
import { route } from "@/lib/http/route";
import { withImportUpload } from "@/lib/imports/service";
import { limit } from "@/lib/rate-limit";
import { runTask } from "@/lib/workers/pool";

/** Checks a location file without writing anything: every problem by line and column, and what an import would do (in a worker thread). */
export const POST = route({ action: "locations.import" }, async ({ request, user }) => {
  await limit("importUser", user.id);
  return withImportUpload(request, async (file) => NextResponse.json({ data: await runTask("imports.previewLocations", { file: { path: file.path, fileName: file.fileName } }) }));
});
