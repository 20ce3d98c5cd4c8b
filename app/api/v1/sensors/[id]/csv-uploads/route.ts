import { NextResponse } from "next/server";
import { requireId } from "@/lib/http/params";
import { route } from "@/lib/http/route";
import { limit } from "@/lib/rate-limit";
import { startCsvUpload } from "@/lib/temperatures/csv-upload";

/**
 * Uploads a logger export (multipart field "file", CSV, at most 100 MB, else 413) for this sensor.
 * 201 with a token valid for an hour, the detected layout (delimiter, decimal mark, header line,
 * column names, first lines) and the mapping to start from (the sensor's remembered one where it fits).
 */
export const POST = route({ action: "readings.upload" }, async ({ request, params, user }) => {
  await limit("importUser", user.id);
  const sensorId = requireId(params, "That sensor");
  return NextResponse.json({ data: await startCsvUpload(user, sensorId, request) }, { status: 201 });
});
