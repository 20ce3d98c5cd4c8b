import { NextResponse } from "next/server";
import { route } from "@/lib/http/route";
import { readImportUpload } from "@/lib/imports/service";
import { runTask, transferable } from "@/lib/workers/pool";

/** Checks a location file without writing anything: every problem by line and column, and what an import would do (in a worker thread). */
export const POST = route({ action: "locations.import" }, async ({ request }) => {
  const { bytes, fileName } = await readImportUpload(request);
  return NextResponse.json({ data: await runTask("imports.previewLocations", { bytes, fileName }, { transferList: transferable(bytes) }) });
});
