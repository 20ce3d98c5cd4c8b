import { NextResponse } from "next/server";
import { route } from "@/lib/http/route";
import { previewContainerImport, withImportUpload } from "@/lib/imports/service";

/** Checks a container file without writing anything: every problem by line and column, and what an import would do. */
export const POST = route({ action: "containers.import" }, async ({ request }) =>
  withImportUpload(request, async (file) => NextResponse.json({ data: await previewContainerImport(file) })),
);
