import { z } from "zod";
import { LOGGER_CSV_LIMITS, JSON_BODY_LIMITS } from "@/lib/limits";
import { csvMappingSchema } from "@/lib/temperatures/csv";
import { MAX_READINGS_PER_BATCH, ingestBodySchema } from "@/lib/temperatures/ingest";
import {
  excursionAcknowledgeSchema,
  excursionListQuerySchema,
  excursionsAcknowledgeSchema,
  sensorCreateSchema,
  sensorListQuerySchema,
  sensorUpdateSchema,
  seriesQuerySchema,
} from "@/lib/temperatures/schemas";
import type { ApiOperation } from "../operation";
import {
  csvImportResultSchema,
  csvPreviewSchema,
  csvUploadSchema,
  dataOf,
  excursionBulkResultSchema,
  excursionListRowSchema,
  excursionSchema,
  ingestResultSchema,
  listPageOf,
  readingInSchema,
  readingSeriesSchema,
  sensorDetailSchema,
  sensorListRowSchema,
  sensorSchema,
} from "../schemas";


const uploadRateLimit = "Too many imports and uploads by you in a short time.";
const tokenPath = z.object({
  id: z.string().regex(/^\d{1,12}$/).meta({ description: "The sensor's numeric id.", example: "5" }),
  token: z.string().meta({ description: "The upload's token from `POST /api/v1/sensors/{id}/csv-uploads`.", example: "0f3c9a1be27d4c5f8a6b1d2e3f405162" }),
});

/** The body of `POST /api/v1/readings` as documented: the route's own schema, with the rows it checks one by one spelled out. */
export const readingsBatchSchema = ingestBodySchema.extend({
  readings: z.array(readingInSchema).min(1).max(MAX_READINGS_PER_BATCH),
});

export const readingsBatchExample = {
  readings: [
    { sensor: "S-205", at: "2026-12-05T08:00:00+01:00", tempC: 4.4 },
    { sensor: "S-205", at: "2026-12-05T08:15:00+01:00", tempC: 4.6 },
    { sensor: "S-206", at: "2026-12-05T08:15:00+01:00", tempC: -19.2 },
  ],
};

/** The demo organisation's published gateway key (db/seed/demo-readings.ts; the test checks they agree). */
export const DEMO_GATEWAY_KEY = "hrk_demo_corvane-logger-gateway-0001";

const tag = "Temperatures";

export const temperatureOperations: ApiOperation[] = [
  {
    method: "post",
    path: "/api/v1/readings",
    tag: "Logger ingest",
    summary: "Send temperature readings",
    description:
      `For loggers and gateways. All or nothing: a batch with any bad row is refused whole (400 \`batch_rejected\`, every row's problem in \`rows\`). A reading identical to a stored one counts as a duplicate; one that differs from the stored reading for its sensor and instant is a conflict, reported and not stored. Each row: \`sensor\` (a registered device id), \`at\` (ISO-8601 with an offset, within the plausible window), \`tempC\` (within the plausible range).

On a demo installation the seeded gateway key is \`${DEMO_GATEWAY_KEY}\` (published for trying it out; revoke it anywhere else):

\`\`\`sh
curl -X POST http://localhost:3000/api/v1/readings \\
  -H 'Authorization: Bearer ${DEMO_GATEWAY_KEY}' -H 'Content-Type: application/json' \\
  -d '{"readings":[{"sensor":"S-205","at":"2026-12-05T08:15:00+01:00","tempC":4.6}]}'
\`\`\``,
    access: { apiKeyScope: "readings:write" },
    body: readingsBatchSchema,
    bodyExamples: { gateway: { summary: "Three readings from the Synthesis laboratory's loggers", value: readingsBatchExample } },
    maxBodyBytes: JSON_BODY_LIMITS.readingsBatchBytes,
    success: { status: 202, description: "Stored (or already there).", schema: ingestResultSchema, example: { accepted: 3, duplicates: 0, conflicts: 0, conflictRows: [] } },
    errors: { 400: "A bad row refuses the whole batch (`batch_rejected`, with `rows`)." },
    workerThread: "A batch of more than 1,000 readings is stored in a worker thread; when its queue is full: `server_busy`, try again in a minute.",
    rateLimited: "Too many batches with this key in a short time.",
  },
  {
    method: "get",
    path: "/api/v1/sensors",
    tag,
    summary: "Sensors",
    access: { action: "temperatures.read" },
    query: sensorListQuerySchema,
    success: { status: 200, description: "A page of sensors.", schema: listPageOf(sensorListRowSchema, "SensorList") },
  },
  {
    method: "post",
    path: "/api/v1/sensors",
    tag,
    summary: "Register a sensor",
    description: "By its device id, attached to one room or one storage unit.",
    access: { action: "sensors.write" },
    body: sensorCreateSchema,
    bodyExamples: { fridge: { summary: "A logger inside a refrigerator", value: { externalId: "S-212", name: "2.107 FR-1 second probe", storageUnitId: 5 } } },
    success: { status: 201, description: "Registered.", schema: dataOf(sensorSchema) },
    errors: { 400: "The room or unit does not exist (named in `fields`).", 409: "A sensor with this device id exists." },
  },
  {
    method: "get",
    path: "/api/v1/sensors/{id}",
    tag,
    summary: "One sensor",
    access: { action: "temperatures.read" },
    success: { status: 200, description: "The sensor.", schema: dataOf(sensorDetailSchema) },
  },
  {
    method: "patch",
    path: "/api/v1/sensors/{id}",
    tag,
    summary: "Change a sensor",
    description: "Rename, change the device id, move (`roomId` or `storageUnitId`) or switch off and on (`active`).",
    access: { action: "sensors.write" },
    body: sensorUpdateSchema,
    bodyExamples: { off: { summary: "Switch it off", value: { active: false } } },
    success: { status: 200, description: "The sensor as stored.", schema: dataOf(sensorDetailSchema) },
    errors: { 409: "A sensor with this device id exists." },
  },
  {
    method: "get",
    path: "/api/v1/sensors/{id}/readings",
    tag,
    summary: "A sensor's trace",
    description: "`from` and `to` as ISO-8601 with an offset (default: the year up to its latest reading). Every reading when there are at most 1,500, otherwise time buckets.",
    access: { action: "temperatures.read" },
    query: seriesQuerySchema,
    success: { status: 200, description: "The series.", schema: dataOf(readingSeriesSchema) },
  },
  {
    method: "post",
    path: "/api/v1/sensors/{id}/csv-uploads",
    tag,
    summary: "Upload a logger export",
    description: "Step 1 of 3: the file is kept for an hour under a token; the answer has the detected layout and the mapping to start from (the sensor's remembered one where it fits).",
    access: { action: "readings.upload" },
    upload: { mediaTypes: ["text/csv"], maxBytes: LOGGER_CSV_LIMITS.maxUploadBytes, description: "The logger's CSV export in the multipart field `file`." },
    success: { status: 201, description: "Held for an hour.", schema: dataOf(csvUploadSchema) },
    errors: { 400: "No file, or a line too long or with too many columns (named)." },
    rateLimited: uploadRateLimit,
  },
  {
    method: "post",
    path: "/api/v1/sensors/{id}/csv-uploads/{token}/preview",
    tag,
    summary: "Preview a logger export",
    description: "Step 2 of 3: reads the upload with the mapping in the body and writes nothing.",
    access: { action: "readings.upload" },
    pathParams: tokenPath,
    body: csvMappingSchema,
    bodyExamples: {
      mapping: {
        summary: "Semicolons, decimal commas, day first",
        value: { delimiter: ";", decimalSeparator: ",", headerLine: 1, dateColumn: "Date", timeColumn: "Time", temperatureColumn: "Temp", unit: "C", dateOrder: "dmy", timeZone: "Europe/Berlin" },
      },
    },
    success: { status: 200, description: "The preview.", schema: dataOf(csvPreviewSchema) },
    errors: { 404: "No such sensor, or the upload is unknown or expired (`upload_not_found`)." },
    workerThread: "The server is busy with other imports and exports (`server_busy`); try again in a minute.",
    rateLimited: uploadRateLimit,
  },
  {
    method: "post",
    path: "/api/v1/sensors/{id}/csv-uploads/{token}/import",
    tag,
    summary: "Import a logger export",
    description: "Step 3 of 3: every reading or none. The mapping and time zone are remembered on the sensor.",
    access: { action: "readings.upload" },
    pathParams: tokenPath,
    body: csvMappingSchema,
    success: { status: 200, description: "Imported.", schema: dataOf(csvImportResultSchema) },
    errors: { 400: "Problems in rows (`import_rejected` with `issues`, `issueCount`, `issueLineCount`, `rowCount`; nothing written).", 404: "No such sensor, or the upload is unknown or expired (`upload_not_found`)." },
    workerThread: "The server is busy with other imports and exports (`server_busy`); try again in a minute.",
    rateLimited: uploadRateLimit,
  },
  {
    method: "get",
    path: "/api/v1/excursions",
    tag,
    summary: "Excursions",
    description: "Open ones first, then newest first; filter by sensor, room (`roomId`; `inRoomId` with its units), unit, open or awaiting acknowledgement.",
    access: { action: "temperatures.read" },
    query: excursionListQuerySchema,
    success: { status: 200, description: "The excursions.", schema: z.object({ data: z.array(excursionListRowSchema) }) },
  },
  {
    method: "post",
    path: "/api/v1/excursions/{id}/acknowledge",
    tag,
    summary: "Acknowledge an excursion",
    description: "With a comment saying what was done.",
    access: { action: "excursions.acknowledge" },
    body: excursionAcknowledgeSchema,
    bodyExamples: { door: { summary: "Door left ajar", value: { comment: "Door found ajar after the delivery; closed it, contents checked, nothing warmer than 9 °C." } } },
    success: { status: 200, description: "Acknowledged.", schema: dataOf(excursionSchema) },
    errors: { 409: "Already acknowledged." },
  },
  {
    method: "post",
    path: "/api/v1/excursions/acknowledge",
    tag,
    summary: "Acknowledge several excursions",
    description: "With one note, in one transaction: each is checked on its own and answered `{ excursionId, ok, error? }` in the order given.",
    access: { action: "excursions.acknowledge" },
    body: excursionsAcknowledgeSchema,
    bodyExamples: { two: { summary: "Two after a power cut", value: { excursionIds: [14, 15], note: "Power cut on 4 December, 40 minutes; both units back in range." } } },
    success: { status: 200, description: "One answer per excursion.", schema: excursionBulkResultSchema },
  },
];
