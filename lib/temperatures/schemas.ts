import { z } from "zod";
import { optionalId, requiredText } from "@/lib/validation/fields";

/** A sensor belongs to exactly one room or one storage unit. */
export const sensorCreateSchema = z
  .object({
    externalId: requiredText("Device id", 100).regex(/^[\x21-\x7E]+$/, "A device id uses printable characters without spaces."),
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
  limit: z.coerce.number({ error: "limit is a whole number from 1 to 1000." }).int("limit is a whole number from 1 to 1000.").min(1, "limit is a whole number from 1 to 1000.").max(1000, "limit is a whole number from 1 to 1000.").optional(),
});
