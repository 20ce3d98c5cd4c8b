import { NextResponse } from "next/server";
import { route } from "@/lib/http/route";
import { limit } from "@/lib/rate-limit";
import { previewLocationImport, withImportUpload } from "@/lib/imports/service";

/** Checks a location file without writing anything: every problem by line and column, and what an import would do. */
export const POST = route({ action: "locations.import" }, async ({ request, user }) => {
  await limit("importUser", user.id);
  return withImportUpload(request, async (file) => NextResponse.json({ data: await previewLocationImport(file) }));
});
