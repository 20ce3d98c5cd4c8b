import { z } from "zod";
import { requiredText, yesNo } from "@/lib/validation/fields";
import { WEBHOOK_EVENT_TYPES } from "./events";
import { WEBHOOK_URL_MAX_LENGTH } from "./url-rules-limits";

const events = z
  .array(z.enum(WEBHOOK_EVENT_TYPES, { error: `Events are: ${WEBHOOK_EVENT_TYPES.join(", ")}.` }), { error: "Tick at least one event." })
  .min(1, "Tick at least one event.")
  .max(WEBHOOK_EVENT_TYPES.length);

export const webhookEndpointSchema = z.object({
  url: requiredText("The address", WEBHOOK_URL_MAX_LENGTH),
  description: requiredText("Description", 200),
  events,
  allowPrivate: yesNo("Allow private addresses").transform((v) => v ?? false),
});

export const webhookEndpointUpdateSchema = webhookEndpointSchema.extend({
  id: z.coerce.number({ error: "Choose an endpoint." }).int().positive("Choose an endpoint."),
});

export const webhookEndpointIdSchema = z.object({ id: z.coerce.number({ error: "Choose an endpoint." }).int().positive("Choose an endpoint.") });

export const webhookEndpointActiveSchema = webhookEndpointIdSchema.extend({
  active: z.enum(["true", "false"], { error: "Choose active or paused." }).transform((v) => v === "true"),
});

export const webhookDeliveryIdSchema = z.object({ id: z.coerce.number({ error: "Choose a delivery." }).int().positive("Choose a delivery.") });
