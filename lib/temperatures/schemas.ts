import { z } from "zod";
import { listQuerySchema } from "@/lib/http/list-query";
import { optionalId, optionalText, requiredId, requiredText, yesNo } from "@/lib/validation/fields";
import { parseOffsetInstant } from "./plausible";

const deviceId = () => requiredText("Device id", 100).regex(/^[\x21-\x7E]+$/, "A device id uses printable characters without spaces.");

/** A sensor belongs to exactly one room or one storage unit. */
export const sensorCreateSchema = z
  .object({
    externalId: deviceId(),
    name: requiredText("Name", 120),
    roomId: optionalId("room"),
    storageUnitId: optionalId("storage unit"),
  })
  .superRefine((value, ctx) => {
    if ((value.roomId == null) === (value.storageUnitId == null)) {
      ctx.addIssue({ code: "custom", path: ["storageUnitId"], message: "Attach the sensor to one room or one storage unit." });
    }
  });
export type SensorInput = z.output<typeof sensorCreateSchema>;

/**
 * A partial change: rename, a new device id, a move (to one room or one storage unit: the other
 * becomes empty) or switching it off/on. A key left out stays as it is.
 */
export const sensorUpdateSchema = z
  .object({
    externalId: deviceId().optional(),
    name: requiredText("Name", 120).optional(),
    roomId: optionalId("room"),
    storageUnitId: optionalId("storage unit"),
    active: z.boolean({ error: "active must be true or false." }).optional(),
  })
  .superRefine((value, ctx) => {
    if (value.roomId === undefined && value.storageUnitId === undefined) return;
    if (value.roomId != null && value.storageUnitId != null) {
      ctx.addIssue({ code: "custom", path: ["storageUnitId"], message: "Attach the sensor to one room or one storage unit, not both." });
    } else if (value.roomId == null && value.storageUnitId == null) {
      ctx.addIssue({ code: "custom", path: ["storageUnitId"], message: "A sensor must stay attached to one room or one storage unit." });
    }
  });
export type SensorUpdate = z.output<typeof sensorUpdateSchema>;

/**
 * The forms choose the location from one select whose values are "room:12" or "unit:34".
 * Turned into roomId / storageUnitId here so the service sees what the API sends.
 */
const locationChoice = z
  .string({ error: "Choose the room or storage unit the sensor is in." })
  .trim()
  .regex(/^(room|unit):[1-9]\d{0,11}$/, "Choose the room or storage unit the sensor is in.");

export function splitLocation(choice: string): { roomId: number | null; storageUnitId: number | null } {
  const [kind, id] = choice.split(":");
  return kind === "room" ? { roomId: Number(id), storageUnitId: null } : { roomId: null, storageUnitId: Number(id) };
}

export const sensorCreateFormSchema = z.object({ externalId: deviceId(), name: requiredText("Name", 120), location: locationChoice });

export const sensorEditFormSchema = z.object({
  id: z.coerce.number({ error: "Choose a sensor." }).int().positive(),
  externalId: deviceId(),
  name: requiredText("Name", 120),
  location: locationChoice,
  active: yesNo("Switched on"),
});

const search = z.string().trim().max(100, "q is at most 100 characters.").optional();

export const SENSOR_SORT_KEYS = ["externalId", "name", "location", "lastReadingAt"] as const;

export const sensorListQuerySchema = listQuerySchema({
  sortable: SENSOR_SORT_KEYS,
  defaultSort: "externalId",
  filters: {
    q: search,
    status: z.enum(["on", "off"], { error: "status must be on or off." }).optional(),
    excursion: z.enum(["open"], { error: "excursion must be open." }).optional(),
  },
});
export type SensorListQuery = z.output<typeof sensorListQuerySchema>;

/** ISO-8601 with an offset, as everywhere in the API. */
const isoInstant = (name: string) =>
  z
    .string({ error: `${name} must be an ISO-8601 time with an offset, e.g. 2026-07-14T00:00:00Z.` })
    .trim()
    .regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d{1,9})?)?(Z|[+-]\d{2}:\d{2})$/, `${name} must be an ISO-8601 time with an offset, e.g. 2026-07-14T00:00:00Z.`)
    .transform((v, ctx) => {
      // Strict: Date.parse would roll 2026-02-30 over into March.
      const instant = parseOffsetInstant(v);
      if (!instant.ok) {
        ctx.addIssue({ code: "custom", message: `${name} ${instant.message}` });
        return z.NEVER;
      }
      return instant.atMs;
    })
    .optional();

export const SERIES_MAX_SPAN_MS = 5 * 366 * 24 * 3600 * 1000;
export const SERIES_MIN_SPAN_MS = 60 * 1000;

/** The chart's window. Both ends optional: without them, the year up to the sensor's latest reading. */
export const seriesQuerySchema = z
  .object({ from: isoInstant("from"), to: isoInstant("to") })
  .superRefine((value, ctx) => {
    if (value.from != null && value.to != null) {
      if (value.to - value.from < SERIES_MIN_SPAN_MS) ctx.addIssue({ code: "custom", path: ["to"], message: "to must be at least a minute after from." });
      else if (value.to - value.from > SERIES_MAX_SPAN_MS) ctx.addIssue({ code: "custom", path: ["to"], message: "The window is at most five years." });
    }
  });
export type SeriesQuery = z.output<typeof seriesQuerySchema>;
export const excursionAcknowledgeSchema = z.object({
  comment: requiredText("Comment", 2000),
});
export type ExcursionAcknowledgeInput = z.output<typeof excursionAcknowledgeSchema>;

export const excursionListQuerySchema = z.object({
  sensorId: optionalId("sensor"),
  roomId: optionalId("room"),
  inRoomId: optionalId("room"),
  storageUnitId: optionalId("storage unit"),
  open: z.enum(["true", "false"], { error: "open is true or false." }).optional(),
  awaitingAcknowledgement: z.enum(["true", "false"], { error: "awaitingAcknowledgement is true or false." }).optional(),
  limit: z.coerce.number({ error: "limit is a whole number from 1 to 1000." }).int("limit is a whole number from 1 to 1000.").min(1, "limit is a whole number from 1 to 1000.").max(1000, "limit is a whole number from 1 to 1000.").optional(),
});

/** The acknowledge form: the excursion and the comment. */
export const excursionAcknowledgeFormSchema = excursionAcknowledgeSchema.extend({
  excursionId: z.coerce.number({ error: "Choose an excursion." }).int("Choose an excursion.").positive("Choose an excursion."),
});

/** Excursions to acknowledge together: one id or a list (a form sends one id per ticked box). */
const excursionIdList = z.preprocess(
  (value) => (value == null || value === "" ? [] : Array.isArray(value) ? value : [value]),
  z
    .array(requiredId("excursion"), { error: "Give the excursions as a list of ids." })
    .min(1, "Tick at least one excursion.")
    .max(500, "Acknowledge at most 500 excursions at once."),
);

/** `POST /api/v1/excursions/acknowledge`: several excursions, one optional note. */
export const excursionsAcknowledgeSchema = z.object({
  excursionIds: excursionIdList,
  note: optionalText("Note", 2000),
});
export type ExcursionsAcknowledgeInput = z.output<typeof excursionsAcknowledgeSchema>;

/** The page's form: the ticked excursions and one note for all of them. */
export const excursionsAcknowledgeFormSchema = excursionsAcknowledgeSchema;
