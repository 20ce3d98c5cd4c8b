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
