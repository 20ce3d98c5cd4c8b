import { NextResponse } from "next/server";
import { requireId } from "@/lib/http/params";
import { route } from "@/lib/http/route";
import { limit } from "@/lib/rate-limit";
import { csvMappingSchema } from "@/lib/temperatures/csv";
import { CsvImportRejectedError } from "@/lib/temperatures/csv-upload";
import { runTask } from "@/lib/workers/pool";

/**
 * Imports the upload with the mapping in the body: every reading or none. 200 with the counts
 * (accepted, duplicates) and the excursion changes; 400 with the problems when any row has one
 * (nothing written). The mapping and time zone are remembered on the sensor. Runs in a worker thread.
 */
export const POST = route({ action: "readings.upload", schema: csvMappingSchema }, async ({ params, user, input }) => {
  await limit("importUser", user.id);
  const sensorId = requireId(params, "That sensor");
  try {
    return NextResponse.json({ data: await runTask("readings.importCsvUpload", { actor: user, sensorId, token: params.token ?? "", mapping: input }) });
  } catch (error) {
    if (error instanceof CsvImportRejectedError) {
      const { issues, issueCount, issueLineCount, rowCount } = error.summary;
      return NextResponse.json({ error: { code: error.code, message: error.message, issues, issueCount, issueLineCount, rowCount } }, { status: 400 });
    }
    throw error;
  }
});
