/** One schema per form, shared by the forms, the server actions and the JSON API. */
import { z } from "zod";
import { ROOM_KINDS, STORAGE_UNIT_KINDS } from "@/db/enums";
import { listQuerySchema } from "@/lib/http/list-query";
import { codeText, optionalId, optionalNumber, optionalText, requiredId, requiredText, yesNo } from "@/lib/validation/fields";

export const siteFields = {
  name: requiredText("Name", 120),
  address: optionalText("Address", 300),
  elevationM: optionalNumber({ label: "Elevation", unit: "m", min: -500, max: 6000 }),
  atmosphericPressureKPa: optionalNumber({ label: "Atmospheric pressure", unit: "kPa", min: 50, max: 110 }),
};
export const siteCreateSchema = z.object(siteFields);
export const siteUpdateSchema = z.object(siteFields).partial();

/** The range a person may set τ in: 5 minutes to 30 days. */
export const WARM_UP_TAU_MIN_MIN = 5;
export const WARM_UP_TAU_MAX_MIN = 30 * 24 * 60;

const tempC = (label: string) => optionalNumber({ label, unit: "°C", min: -200, max: 100 });

const roomFields = {
  siteId: requiredId("site"),
  code: codeText("Room code"),
  name: requiredText("Room name", 120),
  kind: z.enum(ROOM_KINDS, { error: "Choose the kind of room." }),
  floorAreaM2: optionalNumber({ label: "Floor area", unit: "m²", exclusiveMin: 0, max: 100_000 }),
  heightM: optionalNumber({ label: "Height", unit: "m", min: 1.5, max: 30 }),
  airChangesPerHour: optionalNumber({ label: "Air changes per hour", unit: "per hour", min: 0, max: 100 }),
  mixingFactor: optionalNumber({ label: "Mixing factor", exclusiveMin: 0, max: 1 }),
  designMaxTempC: tempC("Design maximum temperature"),
  sprinklered: yesNo("Sprinklered"),
  setMinC: tempC("Set range minimum"),
  setMaxC: tempC("Set range maximum"),
  excursionThresholdC: tempC("Excursion threshold"),
  excursionMinDurationMin: optionalNumber({ label: "Minimum excursion duration", unit: "min", min: 1, max: 10_080, integer: true }),
  facilitiesContactId: optionalId("facilities contact"),
  notes: optionalText("Notes"),
};

function setRangeOrdered(value: { setMinC?: number | null; setMaxC?: number | null }, ctx: z.RefinementCtx) {
  if (value.setMinC != null && value.setMaxC != null && value.setMinC > value.setMaxC) {
    ctx.addIssue({ code: "custom", path: ["setMaxC"], message: "The set range maximum must not be below its minimum." });
  }
}

export const roomCreateSchema = z.object(roomFields).superRefine(setRangeOrdered);
export const roomUpdateSchema = z.object(roomFields).partial().superRefine(setRangeOrdered);
/** The room edit form sends every field, plus the room's id. */
export const roomEditFormSchema = z.object({ ...roomFields, id: requiredId("room") }).superRefine(setRangeOrdered);

const unitFields = {
  roomId: requiredId("room"),
  code: codeText("Unit code"),
  name: requiredText("Unit name", 120),
  kind: z.enum(STORAGE_UNIT_KINDS, { error: "Choose the kind of storage unit." }),
  internalVolumeL: optionalNumber({ label: "Internal volume", unit: "L", exclusiveMin: 0, max: 100_000 }),
  setMinC: tempC("Set range minimum"),
  setMaxC: tempC("Set range maximum"),
  excursionThresholdC: tempC("Excursion threshold"),
  excursionMinDurationMin: optionalNumber({ label: "Minimum excursion duration", unit: "min", min: 1, max: 10_080, integer: true }),
  ventilated: yesNo("Ventilated"),
  ignitionSourceFree: yesNo("Interior free of ignition sources"),
  ownerId: optionalId("owner"),
  notes: optionalText("Notes"),
  /** τ of the unit's warm-up after a failure, set by a person: 5 minutes to 30 days; null goes back to the fitted or default value. */
  warmUpTauMin: optionalNumber({ label: "Warm-up time constant τ", unit: "min", min: WARM_UP_TAU_MIN_MIN, max: WARM_UP_TAU_MAX_MIN }),
  warmUpTauNote: optionalText("Note on the warm-up time constant", 500),
};
export const storageUnitCreateSchema = z.object(unitFields).superRefine(setRangeOrdered);
export const storageUnitUpdateSchema = z.object(unitFields).partial().superRefine(setRangeOrdered);
export const storageUnitEditFormSchema = z.object({ ...unitFields, id: requiredId("storage unit") }).superRefine(setRangeOrdered);

export type SiteInput = z.output<typeof siteCreateSchema>;
export type RoomInput = z.output<typeof roomCreateSchema>;
export type StorageUnitInput = z.output<typeof storageUnitCreateSchema>;

const filterId = z
  .string()
  .optional()
  .transform((v) => (v === undefined || v === "" ? undefined : Number(v)))
  .refine((v) => v === undefined || (Number.isInteger(v) && v > 0), "Must be a positive whole number.");
const search = z.string().trim().max(100, "q is at most 100 characters.").optional();

export const siteListQuerySchema = listQuerySchema({ sortable: ["name"], defaultSort: "name", filters: { q: search } });
export const roomListQuerySchema = listQuerySchema({
  sortable: ["code", "name", "site", "designMaxTempC"],
  defaultSort: "code",
  filters: { q: search, siteId: filterId, kind: z.enum(ROOM_KINDS).optional() },
});
export const storageUnitListQuerySchema = listQuerySchema({
  sortable: ["code", "name", "kind", "room"],
  defaultSort: "room",
  filters: { q: search, siteId: filterId, roomId: filterId, kind: z.enum(STORAGE_UNIT_KINDS).optional() },
});
