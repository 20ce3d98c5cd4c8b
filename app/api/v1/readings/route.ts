import { NextResponse } from "next/server";
import { BatchRejectedError, ingestBodySchema, ingestReadings } from "@/lib/temperatures/ingest";
import { keyRoute } from "@/lib/http/route";
import { JSON_BODY_LIMITS } from "@/lib/limits";
import { limit } from "@/lib/rate-limit";
import { runTask } from "@/lib/workers/pool";

/** Batches above this size are checked and stored in a worker thread; smaller ones here, without the hand-over. */
const WORKER_BATCH_THRESHOLD = 1_000;

/**
 * Logger ingest: `Authorization: Bearer <key>` and `{ "readings": [{ "sensor", "at", "tempC" }] }`.
 * 202 `{ accepted, duplicates, conflicts, conflictRows }` (a conflict: a reading that differs from the
 * one stored for its sensor and instant, which is kept); a batch with any bad row is rejected whole
 * with every row's error.
 */
export const POST = keyRoute({ scope: "readings:write", schema: ingestBodySchema, maxBodyBytes: JSON_BODY_LIMITS.readingsBatchBytes }, async ({ key, input }) => {
  await limit("readingsKey", key.id);
  try {
    const { accepted, duplicates, conflicts, conflictRows } =
      input.readings.length > WORKER_BATCH_THRESHOLD ? await runTask("readings.ingest", { readings: input.readings }) : ingestReadings(input.readings);
    return NextResponse.json({ accepted, duplicates, conflicts, conflictRows }, { status: 202 });
  } catch (error) {
    if (error instanceof BatchRejectedError) {
      return NextResponse.json({ error: { code: error.code, message: error.message, rows: error.rows } }, { status: 400 });
    }
    throw error;
  }
});
