/**
 * Schemas the API document needs beyond the routes' own input schemas: the error shape, path
 * parameters and the answers the routes build by hand. Each answer schema is checked against real
 * answers in tests/integration/openapi-responses.test.ts.
 */
import { z } from "zod";
import { ROLES } from "@/lib/auth/roles";
import { API_KEY_SCOPES } from "@/lib/api-keys/scopes";
import { ALERT_DELIVERIES, AMOUNT_UNITS, CONTAINER_KINDS, CONTAINER_STATES, EXPOSURE_LIMIT_KINDS, FINDING_EVENT_KINDS, FINDING_STATUSES, FRACTION_BASES, PHYSICAL_STATES, ROOM_KINDS, SCENARIOS, SEVERITIES, STORAGE_UNIT_KINDS } from "@/db/enums";

// ---------------------------------------------------------------------------------------------
// Errors
// ---------------------------------------------------------------------------------------------

/** The one JSON error shape (lib/http/route.ts `errorResponse`), with the extras some routes add. */
export const errorSchema = z
  .object({
    error: z.object({
      code: z.string().meta({ description: "A stable code: invalid_input, unauthenticated, forbidden, not_found, conflict, rate_limited, body_too_large, unsupported_media_type, …", example: "invalid_input" }),
      message: z.string().meta({ description: "One plain sentence for people.", example: "Check the highlighted fields." }),
      fields: z.record(z.string(), z.array(z.string())).optional().meta({ description: "400: the problems of each field, by field name." }),
      issues: z
        .array(z.object({ line: z.number().int(), column: z.string().nullable().optional(), message: z.string() }).loose())
        .optional()
        .meta({ description: "Imports refused (`import_rejected`): every problem by line and column." }),
      issueCount: z.number().int().optional().meta({ description: "Logger-file imports: how many problems in all." }),
      issueLineCount: z.number().int().optional().meta({ description: "Logger-file imports: on how many lines." }),
      rowCount: z.number().int().optional().meta({ description: "Logger-file imports: rows read." }),
      rows: z
        .array(z.object({ index: z.number().int(), field: z.string(), message: z.string() }))
        .optional()
        .meta({ description: "Readings batches refused (`batch_rejected`): every bad row by its index in the batch." }),
    }),
  })
  .meta({
    id: "Error",
    description: "Every error answer. `fields`, `issues` and `rows` appear only where they say.",
    example: { error: { code: "invalid_input", message: "Check the highlighted fields.", fields: { name: ["Name is required."] } } },
  });

// ---------------------------------------------------------------------------------------------
// Path parameters
// ---------------------------------------------------------------------------------------------

/** A record's numeric id in the path; anything else answers 404. */
export const idPathSchema = z.object({
  id: z.string().regex(/^\d{1,12}$/).meta({ description: "The record's numeric id.", example: "12" }),
});

// ---------------------------------------------------------------------------------------------
// Shared pieces
// ---------------------------------------------------------------------------------------------

const isoDateTime = z.string().meta({ format: "date-time", example: "2026-11-30T09:12:44.000Z" });
const severity = z.enum(SEVERITIES).meta({ id: "Severity" });
/** The severity enum as a shared component (the webhook payloads use it too). */
export const severitySchema = severity;
export const roleSchema = z.enum(ROLES).meta({ id: "Role" });

/** A paged list: `{ data, page, pageSize, total }` (lib/http/list-query.ts `listPage`). */
export function listPageOf<T extends z.ZodType>(row: T, id: string) {
  return z
    .object({
      data: z.array(row),
      page: z.number().int().min(1),
      pageSize: z.number().int().min(0),
      total: z.number().int().min(0).meta({ description: "Rows matching the filters, over all pages." }),
    })
    .meta({ id });
}

/** `{ data: … }`, the envelope of one record. */
export function dataOf<T extends z.ZodType>(record: T) {
  return z.object({ data: record });
}


// ---------------------------------------------------------------------------------------------
// Accounts
// ---------------------------------------------------------------------------------------------

export const signedInUserSchema = z
  .object({ id: z.number().int(), email: z.string(), name: z.string(), role: roleSchema })
  .meta({ id: "SignedInUser", example: { id: 3, email: "researcher@example.org", name: "Jonas Ekberg", role: "researcher" } });

const alertChoice = z.enum(ALERT_DELIVERIES);
export const meSchema = z
  .object({
    id: z.number().int(),
    email: z.string(),
    name: z.string(),
    role: roleSchema,
    alerts: z.object({ alertExcursions: alertChoice, alertFindings: alertChoice, dailyDigest: z.boolean() }),
  })
  .meta({ id: "Me", example: { id: 2, email: "safety@example.org", name: "Priya Halden", role: "safety_officer", alerts: { alertExcursions: "immediate", alertFindings: "immediate", dailyDigest: true } } });

export const sessionRowSchema = z
  .object({
    id: z.number().int(),
    createdAt: isoDateTime,
    lastSeenAt: isoDateTime,
    userAgent: z.string().nullable(),
    device: z.string().meta({ description: "The browser and system in words." }),
    ip: z.string().nullable(),
    current: z.boolean().meta({ description: "The session of this request." }),
  })
  .meta({ id: "Session", example: { id: 14, createdAt: "2026-12-05T07:58:12.000Z", lastSeenAt: "2026-12-05T09:40:03.000Z", userAgent: "Mozilla/5.0 (X11; Linux x86_64) Chrome/131.0", device: "Chrome on Linux", ip: "10.20.4.17", current: true } });

export const endedSchema = z.object({ ended: z.number().int().min(0).meta({ description: "How many sessions ended." }) });

const signInMethodSchema = z.enum(["password", "sso"]).meta({ description: "How the person signs in: a password of their own, or single sign-on through the institution's provider (no password here)." });

export const userRowSchema = z
  .object({
    id: z.number().int(),
    email: z.string(),
    name: z.string(),
    role: roleSchema,
    active: z.boolean(),
    activated: z.boolean().meta({ description: "Has taken up the invitation: set a password, or signed in once through the institution's provider (single sign-on accounts)." }),
    signInMethod: signInMethodSchema,
    lastSignInAt: isoDateTime.nullable(),
    createdAt: isoDateTime,
  })
  .meta({ id: "User", example: { id: 3, email: "researcher@example.org", name: "Jonas Ekberg", role: "researcher", active: true, activated: true, signInMethod: "password", lastSignInAt: "2026-12-04T15:02:19.000Z", createdAt: "2026-01-12T08:00:00.000Z" } });

export const invitedUserSchema = z.object({
  user: z.object({ id: z.number().int(), email: z.string(), name: z.string(), role: roleSchema, active: z.boolean(), activated: z.literal(false), signInMethod: signInMethodSchema }),
});

const scopeSchema = z.enum(API_KEY_SCOPES);
export const apiKeyRowSchema = z
  .object({
    id: z.number().int(),
    name: z.string(),
    prefix: z.string().meta({ description: "The key's first 12 characters, to recognise it.", example: "hrk_demo_cor" }),
    scopes: z.array(scopeSchema),
    createdAt: isoDateTime,
    lastUsedAt: isoDateTime.nullable(),
    revokedAt: isoDateTime.nullable(),
  })
  .meta({ id: "ApiKey", example: { id: 1, name: "Corvane logger gateway", prefix: "hrk_demo_cor", scopes: ["readings:write"], createdAt: "2026-01-12T08:00:00.000Z", lastUsedAt: "2026-12-05T09:45:00.000Z", revokedAt: null } });

export const apiKeyCreatedSchema = z.object({
  data: z.object({ id: z.number().int(), name: z.string(), prefix: z.string(), scopes: z.array(scopeSchema), createdAt: isoDateTime }),
  key: z.string().meta({ description: "The key itself, shown this once: Headroom keeps only its hash.", example: "hrk_6mN0c2yQpX1r8tVb3kLwZs9aJd4fHe7G" }),
});

export const apiKeyRevokedSchema = dataOf(z.object({ id: z.number().int(), name: z.string(), prefix: z.string(), revokedAt: isoDateTime.nullable() }));

// ---------------------------------------------------------------------------------------------
// Inventory
// ---------------------------------------------------------------------------------------------

export const containerListRowSchema = z
  .object({
    id: z.number().int(),
    label: z.string(),
    substanceId: z.number().int().nullable(),
    substanceName: z.string().nullable(),
    substanceCas: z.string().nullable(),
    mixtureId: z.number().int().nullable(),
    mixtureName: z.string().nullable(),
    amount: z.number(),
    amountUnit: z.enum(AMOUNT_UNITS),
    state: z.enum(CONTAINER_STATES),
    containerKind: z.enum(CONTAINER_KINDS),
    storageUnitId: z.number().int(),
    unitCode: z.string(),
    roomId: z.number().int(),
    roomCode: z.string(),
    siteName: z.string(),
    ownerId: z.number().int().nullable(),
    ownerName: z.string().nullable(),
    expiresAt: isoDateTime.nullable(),
    updatedAt: isoDateTime,
    openFindingSeverity: severity.nullable().meta({ description: "The worst open finding this container contributes to that the reader may see, or null." }),
  })
  .meta({ id: "ContainerListRow" });

// ---------------------------------------------------------------------------------------------
// Register
// ---------------------------------------------------------------------------------------------

const timeToDanger = z
  .object({ minutes: z.number(), threshold: z.string(), tempC: z.number() })
  .meta({ id: "TimeToDanger", description: "Control-lost findings: minutes after a failure at which the finding's severity is reached." });

export const findingListRowSchema = z
  .object({
    id: z.number().int(),
    fingerprint: z.string().meta({ description: "rule | location | subject | scenario: rows that differ only in the scenario are one problem." }),
    rule: z.string(),
    severity,
    status: z.enum(FINDING_STATUSES),
    scenario: z.string(),
    title: z.string(),
    value: z.number().nullable(),
    limit: z.number().nullable(),
    ratio: z.number().nullable().meta({ description: "value ÷ limit." }),
    unit: z.string().nullable(),
    worstCaseTempC: z.number().nullable(),
    worstCaseSource: z.string().nullable(),
    timeToDanger: timeToDanger.nullable(),
    firstRaisedAt: isoDateTime,
    updatedAt: isoDateTime,
    location: z.object({
      siteId: z.number().int().nullable(),
      siteName: z.string().nullable(),
      roomId: z.number().int().nullable(),
      roomCode: z.string().nullable(),
      storageUnitId: z.number().int().nullable(),
      unitCode: z.string().nullable(),
      label: z.string(),
    }),
    substance: z.object({ id: z.number().int(), name: z.string(), cas: z.string().nullable() }).nullable(),
    mixture: z.object({ id: z.number().int(), name: z.string() }).nullable(),
    containerId: z.number().int().nullable(),
    assignee: z.object({ id: z.number().int(), name: z.string() }).nullable(),
  })
  .meta({ id: "FindingListRow" });

export const bulkResultSchema = z
  .object({ data: z.array(z.object({ findingId: z.number().int(), ok: z.boolean(), error: z.string().optional() })) })
  .meta({ id: "BulkFindingResult" });

export const storagePlanItemSchema = z
  .object({
    storageUnitId: z.number().int(),
    code: z.string(),
    name: z.string(),
    unitKind: z.enum(STORAGE_UNIT_KINDS),
    roomId: z.number().int(),
    roomCode: z.string(),
    roomName: z.string(),
    siteId: z.number().int(),
    siteName: z.string(),
    verdict: z.enum(["no_findings", "already_flagged", "raises"]),
    worstSeverity: severity.nullable(),
    maxRatio: z.number().nullable(),
    timeToDanger: timeToDanger.nullable(),
    raised: z.number().int().min(0),
    nearness: z.enum(["same_room", "same_site", "other_site"]),
    reason: z.string().meta({ description: "One plain sentence: why this place ranks where it does." }),
  })
  .meta({ id: "StoragePlanItem", example: { storageUnitId: 1, code: "FC-1", name: "Flammable-liquid cabinet, 45 gal", unitKind: "flammable_cabinet", roomId: 1, roomCode: "B-014", roomName: "Solvent store", siteId: 1, siteName: "North Campus", verdict: "no_findings", worstSeverity: null, maxRatio: null, timeToDanger: null, raised: 0, nearness: "same_site", reason: "Nothing about it would be flagged here." } });

export const storagePlanSchemaOut = z
  .object({ data: z.array(storagePlanItemSchema), message: z.string().optional().meta({ description: "Only when no unit can hold the amount." }) })
  .meta({ id: "StoragePlan" });

// ---------------------------------------------------------------------------------------------
// Temperatures
// ---------------------------------------------------------------------------------------------

/** One reading as a logger sends it (the rows of `POST /api/v1/readings`, checked row by row in lib/temperatures/ingest.ts). */
export const readingInSchema = z
  .object({
    sensor: z.string().min(1).max(100).meta({ description: "The logger's device id, as registered.", example: "S-205" }),
    at: z.string().meta({ description: "ISO-8601 with an offset.", example: "2026-12-05T08:15:00+01:00" }),
    tempC: z.number().meta({ description: "°C.", example: 4.6 }),
  })
  .meta({ id: "Reading" });

export const ingestResultSchema = z
  .object({
    accepted: z.number().int().min(0).meta({ description: "New readings stored." }),
    duplicates: z.number().int().min(0).meta({ description: "Readings already stored with the same temperature." }),
    conflicts: z.number().int().min(0).meta({ description: "Readings that differ from the one stored for their sensor and instant (the stored one is kept)." }),
    conflictRows: z.array(z.object({ index: z.number().int(), sensor: z.string(), at: z.string(), tempC: z.number(), storedTempC: z.number() })),
  })
  .meta({ id: "IngestResult", example: { accepted: 3, duplicates: 0, conflicts: 0, conflictRows: [] } });

export const excursionBulkResultSchema = z.object({
  data: z.array(z.object({ excursionId: z.number().int(), ok: z.boolean(), error: z.string().optional() })),
});



// ---------------------------------------------------------------------------------------------
// Locations
// ---------------------------------------------------------------------------------------------

const id = z.number().int();
const nullableNumber = z.number().nullable();

export const siteSchema = z
  .object({
    id,
    name: z.string(),
    address: z.string().nullable(),
    elevationM: nullableNumber,
    atmosphericPressureKPa: z.number().meta({ description: "The local atmospheric pressure the assessment uses." }),
    retiredAt: isoDateTime.nullable(),
    createdAt: isoDateTime,
    updatedAt: isoDateTime,
  })
  .meta({ id: "Site", example: { id: 1, name: "North Campus", address: "1 Quarry Lane, Eastmoor", elevationM: 35, atmosphericPressureKPa: 101.325, retiredAt: null, createdAt: "2026-01-12T08:00:00.000Z", updatedAt: "2026-01-12T08:00:00.000Z" } });

const setRange = {
  setMinC: nullableNumber,
  setMaxC: nullableNumber,
  excursionThresholdC: nullableNumber,
  excursionMinDurationMin: z.number().int().nullable(),
};

const roomColumns = {
  id,
  siteId: id,
  code: z.string(),
  name: z.string(),
  kind: z.enum(ROOM_KINDS),
  floorAreaM2: nullableNumber,
  heightM: nullableNumber,
  airChangesPerHour: nullableNumber,
  mixingFactor: z.number().meta({ description: "Well-mixed room model mixing factor k (0 < k ≤ 1)." }),
  designMaxTempC: nullableNumber,
  sprinklered: z.boolean(),
  ...setRange,
  facilitiesContactId: id.nullable(),
  notes: z.string().nullable(),
  retiredAt: isoDateTime.nullable(),
  assessedAt: isoDateTime.nullable(),
  assessmentInputKey: z.string().nullable().meta({ description: "A digest of what the room's own rules read at its last assessment." }),
  createdAt: isoDateTime,
  updatedAt: isoDateTime,
};

/** A room as stored (the answer of a change or a retirement). */
export const roomSchema = z.object(roomColumns).meta({ id: "Room" });

const unitColumns = {
  id,
  roomId: id,
  code: z.string(),
  name: z.string(),
  kind: z.enum(STORAGE_UNIT_KINDS),
  internalVolumeL: nullableNumber,
  ...setRange,
  ventilated: z.boolean(),
  ignitionSourceFree: z.boolean(),
  warmUpTauMin: nullableNumber.meta({ description: "τ of the warm-up after a failure, set by a person (minutes); null: fitted or the default of its kind." }),
  warmUpTauNote: z.string().nullable(),
  ownerId: id.nullable(),
  notes: z.string().nullable(),
  retiredAt: isoDateTime.nullable(),
  assessmentInputKey: z.string().nullable(),
  assessedAt: isoDateTime.nullable(),
  createdAt: isoDateTime,
  updatedAt: isoDateTime,
};

/** A storage unit as stored (the answer of a change or a retirement). */
export const storageUnitSchema = z.object(unitColumns).meta({ id: "StorageUnit" });

/** One storage unit with its room, site and owner (GET, and the answer of POST). */
export const storageUnitDetailSchema = storageUnitSchema
  .extend({ roomCode: z.string(), roomName: z.string(), siteId: id, siteName: z.string(), ownerName: z.string().nullable() })
  .meta({ id: "StorageUnitDetail" });

/** One room with its site, contact, volume and live units (GET, and the answer of POST). */
export const roomDetailSchema = roomSchema
  .extend({
    siteName: z.string(),
    facilitiesContactName: z.string().nullable(),
    volumeM3: nullableNumber,
    units: z.array(z.object({ unit: storageUnitSchema, containerCount: z.number().int().min(0) })),
  })
  .meta({ id: "RoomDetail" });

export const roomListRowSchema = z
  .object({
    id,
    siteId: id,
    siteName: z.string(),
    code: z.string(),
    name: z.string(),
    kind: z.enum(ROOM_KINDS),
    floorAreaM2: nullableNumber,
    heightM: nullableNumber,
    volumeM3: nullableNumber,
    airChangesPerHour: nullableNumber,
    mixingFactor: z.number(),
    designMaxTempC: nullableNumber,
    sprinklered: z.boolean(),
    setMinC: nullableNumber,
    setMaxC: nullableNumber,
    facilitiesContactId: id.nullable(),
  })
  .meta({ id: "RoomListRow" });

export const storageUnitListRowSchema = z
  .object({
    id,
    roomId: id,
    roomCode: z.string(),
    siteId: id,
    siteName: z.string(),
    code: z.string(),
    name: z.string(),
    kind: z.enum(STORAGE_UNIT_KINDS),
    internalVolumeL: nullableNumber,
    ...setRange,
    ventilated: z.boolean(),
    ignitionSourceFree: z.boolean(),
    ownerId: id.nullable(),
  })
  .meta({ id: "StorageUnitListRow" });

// ---------------------------------------------------------------------------------------------
// Sensors and excursions
// ---------------------------------------------------------------------------------------------

/** A sensor as stored (the answer of a registration). */
export const sensorSchema = z
  .object({
    id,
    externalId: z.string().meta({ description: "The logger's device id; readings name it as `sensor`.", example: "S-205" }),
    name: z.string(),
    roomId: id.nullable(),
    storageUnitId: id.nullable(),
    csvMapping: z.record(z.string(), z.unknown()).nullable().meta({ description: "The logger-file column mapping remembered from the last import." }),
    timeZone: z.string().nullable(),
    active: z.boolean(),
    createdAt: isoDateTime,
    updatedAt: isoDateTime,
  })
  .meta({ id: "Sensor" });

export const sensorListRowSchema = z
  .object({
    id,
    externalId: z.string(),
    name: z.string(),
    active: z.boolean(),
    roomId: id.meta({ description: "The room it hangs in, or its unit's room." }),
    roomCode: z.string(),
    roomName: z.string(),
    storageUnitId: id.nullable(),
    unitCode: z.string().nullable(),
    unitName: z.string().nullable(),
    lastReadingAt: z.number().nullable().meta({ description: "Epoch milliseconds of the latest reading." }),
    lastReadingTempC: nullableNumber,
    openExcursions: z.number().int().min(0),
  })
  .meta({ id: "SensorListRow", example: { id: 5, externalId: "S-205", name: "2.115 FSR-1 interior", active: true, roomId: 3, roomCode: "2.115", roomName: "Synthesis laboratory", storageUnitId: 7, unitCode: "FSR-1", unitName: "Flammable-storage refrigerator", lastReadingAt: 1796461200000, lastReadingTempC: 4.6, openExcursions: 0 } });

/** One sensor with its place, latest reading and open excursions (GET, and the answer of PATCH). */
export const sensorDetailSchema = sensorListRowSchema.extend({ createdAt: isoDateTime, siteName: z.string() }).meta({ id: "SensorDetail" });

export const excursionListRowSchema = z
  .object({
    id,
    sensorId: id,
    sensorExternalId: z.string(),
    sensorName: z.string(),
    roomId: id.nullable(),
    roomCode: z.string().nullable(),
    storageUnitId: id.nullable(),
    unitCode: z.string().nullable(),
    thresholdC: z.number(),
    startAt: isoDateTime,
    endAt: isoDateTime.nullable().meta({ description: "Null while the excursion is open." }),
    peakTempC: z.number(),
    peakAt: isoDateTime,
    durationMin: z.number().min(0).meta({ description: "End − start; for an open excursion, up to the latest reading." }),
    acknowledgedAt: isoDateTime.nullable(),
    acknowledgedByName: z.string().nullable(),
    acknowledgeComment: z.string().nullable(),
  })
  .meta({ id: "ExcursionListRow", example: { id: 9, sensorId: 5, sensorExternalId: "S-205", sensorName: "2.115 FSR-1 interior", roomId: null, roomCode: "2.115", storageUnitId: 7, unitCode: "FSR-1", thresholdC: 8, startAt: "2026-11-14T18:20:00.000Z", endAt: "2026-11-16T07:05:00.000Z", peakTempC: 19.4, peakAt: "2026-11-16T06:50:00.000Z", durationMin: 2205, acknowledgedAt: "2026-11-16T08:12:00.000Z", acknowledgedByName: "Mireille Okafor", acknowledgeComment: "Compressor failed over the weekend; contents moved to FSR-2, service called." } });

/** An excursion as stored (the answer of an acknowledgement). */
export const excursionSchema = z
  .object({
    id,
    sensorId: id,
    roomId: id.nullable(),
    storageUnitId: id.nullable(),
    thresholdC: z.number(),
    startAt: isoDateTime,
    endAt: isoDateTime.nullable(),
    peakTempC: z.number(),
    peakAt: isoDateTime,
    acknowledgedAt: isoDateTime.nullable(),
    acknowledgedById: id.nullable(),
    acknowledgeComment: z.string().nullable(),
    createdAt: isoDateTime,
    updatedAt: isoDateTime,
  })
  .meta({ id: "Excursion" });

// ---------------------------------------------------------------------------------------------
// Containers and mixtures
// ---------------------------------------------------------------------------------------------

/** One container with its contents, place, owner and history of moves. */
export const containerSchema = z
  .object({
    id,
    label: z.string(),
    substanceId: id.nullable(),
    mixtureId: id.nullable(),
    amount: z.number(),
    amountUnit: z.enum(AMOUNT_UNITS),
    capacity: nullableNumber,
    capacityUnit: z.enum(AMOUNT_UNITS).nullable(),
    containerKind: z.enum(CONTAINER_KINDS),
    state: z.enum(CONTAINER_STATES),
    storageUnitId: id,
    ownerId: id.nullable(),
    receivedAt: isoDateTime.nullable(),
    openedAt: isoDateTime.nullable(),
    expiresAt: isoDateTime.nullable(),
    sdsFileId: id.nullable().meta({ description: "Its safety data sheet: `GET /api/v1/files/{id}`." }),
    notes: z.string().nullable(),
    createdAt: isoDateTime,
    updatedAt: isoDateTime,
    substanceName: z.string().nullable(),
    substanceCas: z.string().nullable(),
    mixtureName: z.string().nullable(),
    unitCode: z.string(),
    unitName: z.string(),
    roomId: id,
    roomCode: z.string(),
    siteId: id,
    siteName: z.string(),
    ownerName: z.string().nullable(),
    ownerEmail: z.string().nullable(),
    moves: z.array(
      z.object({
        id,
        movedAt: isoDateTime,
        fromUnitCode: z.string().nullable(),
        fromRoomCode: z.string().nullable(),
        toUnitCode: z.string(),
        toRoomCode: z.string(),
        movedBy: z.string().nullable(),
      }),
    ),
  })
  .meta({ id: "Container" });

export const mixtureSchema = z
  .object({
    id,
    name: z.string(),
    description: z.string().nullable(),
    fractionBasis: z.enum(FRACTION_BASES),
    createdById: id.nullable(),
    retiredAt: isoDateTime.nullable(),
    createdAt: isoDateTime,
    updatedAt: isoDateTime,
    components: z.array(z.object({ substanceId: id, fraction: z.number(), name: z.string(), cas: z.string().nullable() })),
  })
  .meta({ id: "Mixture" });

export const mixtureListRowSchema = z
  .object({
    id,
    name: z.string(),
    description: z.string().nullable(),
    fractionBasis: z.enum(FRACTION_BASES),
    createdAt: isoDateTime,
    components: z.number().int().meta({ description: "How many components." }),
  })
  .meta({ id: "MixtureListRow" });

// ---------------------------------------------------------------------------------------------
// Substances
// ---------------------------------------------------------------------------------------------

export const substanceSummarySchema = z
  .object({
    id,
    cas: z.string().nullable(),
    name: z.string(),
    synonyms: z.array(z.string()),
    formula: z.string().nullable(),
    physicalState: z.enum(PHYSICAL_STATES),
    molarMassGPerMol: nullableNumber,
    normalBoilingPointC: nullableNumber,
    flashPointC: nullableNumber,
    lflVolPercent: nullableNumber,
    uflVolPercent: nullableNumber,
    ghsFlammableCategory: z.union([z.literal(1), z.literal(2), z.literal(3), z.literal(4)]).nullable(),
    nfpaLiquidClass: z.string().nullable(),
    retired: z.boolean(),
  })
  .meta({ id: "SubstanceSummary" });

export const substanceSchema = substanceSummarySchema
  .extend({
    meltingPointC: nullableNumber,
    enthalpyOfVaporizationKJPerMol: nullableNumber,
    enthalpyOfSublimationKJPerMol: nullableNumber,
    liquidDensityKgPerM3: nullableNumber,
    autoignitionTempC: nullableNumber,
    lowerFlammableTemperatureC: nullableNumber,
    correlations: z.array(z.object({ kind: z.string() }).loose()).meta({ description: "Vapor-pressure correlations with their coefficients, range and source." }),
    exposureLimits: z.array(
      z.object({ kind: z.enum(EXPOSURE_LIMIT_KINDS), value: z.number(), unit: z.string(), body: z.string().nullable(), source: z.string().nullable(), note: z.string().nullable() }),
    ),
    sources: z.record(z.string(), z.string()).meta({ description: "The source of each value, by field name." }),
    alternatives: z.array(z.object({}).loose()).meta({ description: "Less hazardous alternatives named for the substance." }),
    notes: z.string().nullable(),
    updatedAt: isoDateTime,
  })
  .meta({ id: "Substance" });

export const vaporPressureSchema = z
  .object({
    substanceId: id,
    tempC: z.number(),
    ambientPressureKPa: z.number(),
    pressureKPa: z.number().meta({ description: "Saturation vapor pressure." }),
    method: z.string().meta({ description: "The correlation used.", example: "wagner" }),
    extrapolated: z.boolean().meta({ description: "Outside the correlation's range." }),
    warnings: z.array(z.string()),
    saturatedConcentration: z.object({
      ppm: z.number(),
      mgPerM3: z.number(),
      volumePercent: z.number(),
      boils: z.boolean().meta({ description: "At or above the boiling point at this pressure." }),
      warnings: z.array(z.string()),
    }),
  })
  .meta({ id: "VaporPressure", description: "A screening estimate from the library's correlation." });

// ---------------------------------------------------------------------------------------------
// Findings, settings, audit
// ---------------------------------------------------------------------------------------------

const findingEventSchemaOut = z
  .object({
    id,
    kind: z.enum(FINDING_EVENT_KINDS),
    fromStatus: z.enum(FINDING_STATUSES).nullable(),
    toStatus: z.enum(FINDING_STATUSES).nullable(),
    note: z.string().nullable(),
    data: z.record(z.string(), z.unknown()).nullable().meta({ description: "The step's own fields (plan, assignee, review date, …)." }),
    at: isoDateTime,
    actorId: id.nullable(),
    actorName: z.string().nullable(),
  })
  .loose()
  .meta({ id: "FindingEvent", description: "One step in a finding's history. `GET /api/v1/findings/{id}` adds `actor: { id, name }`." });

/** One finding as stored, with its trace and events. The core fields are named; the stored row's others come along. */
export const findingSchema = z
  .object({
    id,
    fingerprint: z.string(),
    rule: z.string(),
    severity,
    status: z.enum(FINDING_STATUSES),
    scenario: z.string(),
    title: z.string(),
    value: nullableNumber,
    limit: nullableNumber.meta({ description: "The limit the value is compared with (also stored as `limitValue`)." }),
    ratio: nullableNumber,
    unit: z.string().nullable(),
    roomId: id.nullable(),
    storageUnitId: id.nullable(),
    substanceId: id.nullable(),
    mixtureId: id.nullable(),
    timeToDanger: timeToDanger.nullable(),
    lastEvaluatedAt: isoDateTime.nullable(),
    trace: z.unknown().nullable().meta({ description: "The calculation trace: each step with its inputs, formula and result." }),
    events: z.array(findingEventSchemaOut),
    message: z.string().optional().meta({ description: "After a resolve: whether the condition is gone or still holds." }),
  })
  .loose()
  .meta({ id: "Finding" });

export const auditEventSchema = z
  .object({
    id,
    at: isoDateTime,
    actorId: id.nullable(),
    actorLabel: z.string().meta({ description: "Who acted: an e-mail address, an API key or the system." }),
    action: z.string(),
    entityType: z.string(),
    entityId: z.string().nullable(),
    summary: z.string(),
    before: z.unknown().nullable(),
    after: z.unknown().nullable(),
    changes: z.array(z.object({ field: z.string(), label: z.string(), before: z.string(), after: z.string() })).meta({ description: "The fields that changed, in words." }),
  })
  .meta({ id: "AuditEvent" });

// ---------------------------------------------------------------------------------------------
// Files, imports, warm-up
// ---------------------------------------------------------------------------------------------

export const attachedFileSchema = z
  .object({
    fileId: id.meta({ description: "Read it with `GET /api/v1/files/{id}`." }),
    originalName: z.string(),
    sizeBytes: z.number().int(),
    sha256: z.string(),
  })
  .meta({ id: "AttachedFile" });

const importIssueSchema = z
  .object({
    line: z.number().int().meta({ description: "The row number as a spreadsheet program shows it." }),
    column: z.string(),
    value: z.string().meta({ description: "The cell as it was in the file." }),
    message: z.string(),
  })
  .meta({ id: "ImportIssue" });

export const containerImportPreviewSchema = z
  .object({
    rowCount: z.number().int(),
    issues: z.array(importIssueSchema),
    toCreate: z.number().int(),
    toUpdate: z.number().int(),
    unchanged: z.number().int(),
    notices: z.array(z.string()),
  })
  .meta({ id: "ContainerImportPreview" });

export const containerImportResultSchema = z
  .object({ created: z.number().int(), updated: z.number().int(), unchanged: z.number().int() })
  .meta({ id: "ContainerImportResult" });

const locationCounts = z.object({ sites: z.number().int(), rooms: z.number().int(), units: z.number().int() }).meta({ id: "LocationCounts" });

export const locationImportPreviewSchema = z
  .object({
    rowCount: z.number().int(),
    issues: z.array(importIssueSchema),
    toCreate: locationCounts,
    toUpdate: locationCounts,
    unchanged: locationCounts,
    notices: z.array(z.string()),
  })
  .meta({ id: "LocationImportPreview" });

export const locationImportResultSchema = z.object({ created: locationCounts, updated: locationCounts, unchanged: locationCounts }).meta({ id: "LocationImportResult" });

export const warmUpSchema = z
  .object({
    tauMinutes: z.number().meta({ description: "τ of Newton's law of heating, in minutes." }),
    source: z.enum(["set", "fitted", "default"]),
    fit: z.object({ excursions: z.number().int(), readings: z.number().int(), rmsErrorC: z.number() }).nullable(),
    roomTempC: nullableNumber.meta({ description: "What the unit warms towards: its room's worst case." }),
    reason: z.string(),
    note: z.string().nullable(),
    fitHistory: z.array(
      z.object({
        tauMinutes: z.number(),
        rmsErrorC: z.number(),
        excursions: z.number().int(),
        readings: z.number().int(),
        roomTempC: z.number(),
        roomTempSource: z.enum(["sensor", "design"]),
        excursionIds: z.array(id),
        fittedAt: isoDateTime,
      }),
    ),
  })
  .meta({ id: "WarmUp" });

// ---------------------------------------------------------------------------------------------
// Logger files
// ---------------------------------------------------------------------------------------------

const epochMs = z.number().meta({ description: "Epoch milliseconds." });
const csvRowErrorSchema = z.object({ line: z.number().int(), column: z.string(), value: z.string(), message: z.string() }).meta({ id: "CsvRowError" });

export const csvUploadSchema = z
  .object({
    token: z.string().meta({ description: "Names the upload in the preview and import, for an hour.", example: "0f3c9a1be27d4c5f8a6b1d2e3f405162" }),
    fileName: z.string(),
    sizeBytes: z.number().int(),
    encoding: z.enum(["utf-8", "utf-16le", "utf-16be", "windows-1252"]),
    expiresAtMs: epochMs,
    layout: z
      .object({
        delimiter: z.string(),
        decimalSeparator: z.string(),
        headerLine: z.number().int(),
        headers: z.array(z.string()),
        sampleLines: z.array(z.object({ line: z.number().int(), text: z.string() })),
        sampleRows: z.array(z.object({ line: z.number().int(), cells: z.array(z.string()) })),
        suggested: z.object({}).loose(),
        timestampsHaveOffset: z.boolean(),
      })
      .meta({ description: "What the file looks like, as detected." }),
    mapping: z.object({}).loose().meta({ description: "The mapping to start from (the body of the preview and import), as far as it could be filled in." }),
    remembered: z.boolean().meta({ description: "The sensor's mapping from an earlier import was used." }),
    sensor: z.object({ id, externalId: z.string(), name: z.string() }),
  })
  .meta({ id: "CsvUpload" });

const csvScan = {
  rowCount: z.number().int(),
  readingCount: z.number().int().meta({ description: "Distinct instants with a valid reading." }),
  repeatedInFile: z.number().int(),
  firstAtMs: epochMs.nullable(),
  lastAtMs: epochMs.nullable(),
  issues: z.array(csvRowErrorSchema).meta({ description: "The first 500 problems by line and column." }),
  issueCount: z.number().int(),
  issueLineCount: z.number().int(),
};

export const csvPreviewSchema = z
  .object({
    ...csvScan,
    rows: z.array(z.object({ line: z.number().int(), atMs: epochMs, tempC: z.number(), timeText: z.string(), temperatureText: z.string() })).meta({ description: "The first 20 readings beside what the file says." }),
    alreadyStored: z.number().int(),
    conflicts: z.number().int(),
    conflictRows: z.array(z.object({ line: z.number().int(), atMs: epochMs, tempC: z.number(), storedTempC: z.number() })),
  })
  .meta({ id: "CsvPreview" });

export const csvImportResultSchema = z
  .object({
    accepted: z.number().int(),
    duplicates: z.number().int(),
    alreadyStored: z.number().int(),
    conflicts: z.number().int(),
    repeatedInFile: z.number().int(),
    rowCount: z.number().int(),
    firstAtMs: epochMs.nullable(),
    lastAtMs: epochMs.nullable(),
    excursions: z.object({ opened: z.number().int(), closed: z.number().int(), updated: z.number().int() }),
  })
  .meta({ id: "CsvImportResult" });

export const readingSeriesSchema = z
  .object({
    sensor: z.object({ id, externalId: z.string(), name: z.string(), active: z.boolean() }),
    location: z.object({
      kind: z.enum(["room", "unit"]),
      id,
      code: z.string(),
      name: z.string(),
      setMinC: nullableNumber,
      setMaxC: nullableNumber,
      thresholdC: nullableNumber,
      minDurationMin: nullableNumber,
    }),
    fromMs: epochMs,
    toMs: epochMs,
    resolution: z.enum(["raw", "bucket"]).meta({ description: "`raw`: every reading in the window; `bucket`: one point per `bucketMs`." }),
    bucketMs: z.number().nullable(),
    points: z.array(z.object({ atMs: epochMs, tempC: z.number(), minC: z.number(), maxC: z.number(), count: z.number().int() })),
    summary: z.object({
      count: z.number().int(),
      minC: nullableNumber,
      minAtMs: epochMs.nullable(),
      maxC: nullableNumber,
      maxAtMs: epochMs.nullable(),
      last: z.object({ atMs: epochMs, tempC: z.number() }).nullable(),
    }),
    extent: z.object({ firstAtMs: epochMs, lastAtMs: epochMs }).nullable(),
    excursions: z.array(
      z.object({ id, thresholdC: z.number(), startAtMs: epochMs, endAtMs: epochMs.nullable(), peakTempC: z.number(), peakAtMs: epochMs, acknowledged: z.boolean() }),
    ),
  })
  .meta({ id: "ReadingSeries" });

// ---------------------------------------------------------------------------------------------
// The what-if
// ---------------------------------------------------------------------------------------------

const scenario = z.enum(SCENARIOS);

export const assessmentPreviewResultSchema = z
  .object({
    storageUnitId: id,
    findings: z
      .array(
        z.object({
          rule: z.string(),
          severity,
          scenario,
          title: z.string(),
          value: nullableNumber,
          limit: nullableNumber,
          ratio: nullableNumber,
          unit: z.string().nullable(),
          worstCaseTempC: nullableNumber,
          worstCaseSource: z.string().nullable(),
          storageUnitId: id.nullable(),
          roomId: id.nullable(),
          isNew: z.boolean(),
          previous: z.object({ severity, ratio: nullableNumber }).nullable().meta({ description: "A finding made worse: how it stands now." }),
          trace: z.unknown(),
        }),
      )
      .meta({ description: "The new or worse findings the change would raise." }),
    current: z
      .array(
        z.object({
          id,
          rule: z.string(),
          severity,
          status: z.enum(FINDING_STATUSES),
          scenario,
          title: z.string(),
          value: nullableNumber,
          limit: nullableNumber,
          ratio: nullableNumber,
          unit: z.string().nullable(),
          storageUnitId: id.nullable(),
          roomId: id.nullable(),
          substanceId: id.nullable(),
          mixtureId: id.nullable(),
          about: z.enum(["substance", "group"]),
          outcome: z.enum(["unchanged", "worse", "better", "cleared"]),
          after: z.object({ severity, ratio: nullableNumber, value: nullableNumber }).nullable(),
          canOpen: z.boolean(),
        }),
      )
      .meta({ description: "The findings standing there about the same substance or its group, whether or not the change alters them." }),
    verdict: z.enum(["raises", "already_flagged", "no_findings"]),
    verdictSentence: z.string(),
    cleared: z.array(z.object({ id, severity, title: z.string(), canOpen: z.boolean() })).meta({ description: "For a move: the findings at the old place that would go." }),
    alternatives: z.array(storagePlanItemSchema).meta({ description: "Up to five safer places, best first; empty when the verdict is no_findings." }),
  })
  .meta({ id: "AssessmentPreview" });
