import { NextResponse } from "next/server";
import { route } from "@/lib/http/route";
import { limit } from "@/lib/rate-limit";
import { previewContainerImport, readImportUpload } from "@/lib/imports/service";

/** Checks a container file without writing anything: every problem by line and column, and what an import would do. */
export const POST = route({ action: "containers.import" }, async ({ request, user }) => {
  await limit("importUser", user.id);
  const { bytes, fileName } = await readImportUpload(request);
  return NextResponse.json({ data: await previewContainerImport(bytes, fileName) });
});
