import { NextResponse } from "next/server";
import { route } from "@/lib/http/route";
import { limit } from "@/lib/rate-limit";
import { previewContainerImport, withImportUpload } from "@/lib/imports/service";

/** Checks a container file without writing anything: every problem by line and column, and what an import would do. */
export const POST = route({ action: "containers.import" }, async ({ request, user }) => {
  await limit("importUser", user.id);
  return withImportUpload(request, async (file) => NextResponse.json({ data: await previewContainerImport(file) }));
});
