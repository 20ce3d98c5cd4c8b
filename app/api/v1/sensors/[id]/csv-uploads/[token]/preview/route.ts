import { NextResponse } from "next/server";
import { requireId } from "@/lib/http/params";
import { route } from "@/lib/http/route";
import { limit } from "@/lib/rate-limit";
import { csvMappingSchema } from "@/lib/temperatures/csv";
import { runTask } from "@/lib/workers/pool";

/**
 * Reads the upload with the mapping in the body and writes nothing: the first 20 readings, the
 * row count, the first and last instant, how many are already stored, and every problem by line
 * and column (the first 500 listed, all counted). Runs in a worker thread.
 */
export const POST = route({ action: "readings.upload", schema: csvMappingSchema }, async ({ params, user, input }) => {
  await limit("importUser", user.id);
  const sensorId = requireId(params, "That sensor");
  return NextResponse.json({ data: await runTask("readings.previewCsvUpload", { actor: user, sensorId, token: params.token ?? "", mapping: input }) });
});
