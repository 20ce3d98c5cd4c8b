"use server";
import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/auth/form-action";
import { limit } from "@/lib/rate-limit";
import { kickWebhooks } from "@/lib/webhooks/deliver";
import {
  webhookDeliveryIdSchema,
  webhookEndpointActiveSchema,
  webhookEndpointIdSchema,
  webhookEndpointSchema,
  webhookEndpointUpdateSchema,
} from "@/lib/webhooks/schemas";
import { createWebhookEndpoint, retryWebhookDelivery, rotateWebhookSecret, setWebhookEndpointActive, updateWebhookEndpoint } from "@/lib/webhooks/service";

/** Answers with the new signing secret itself as the message: the form shows it this once; it is stored encrypted. */
export const createWebhookEndpointAction = formAction({ action: "webhooks.manage", schema: webhookEndpointSchema }, async ({ user, input }) => {
  await limit("webhookSaveUser", user.id);
  const { secret } = await createWebhookEndpoint(user, input);
  revalidatePath("/admin/webhooks");
  return secret;
});

export const updateWebhookEndpointAction = formAction({ action: "webhooks.manage", schema: webhookEndpointUpdateSchema }, async ({ user, input }) => {
  await limit("webhookSaveUser", user.id);
  const { id, ...fields } = input;
  const after = await updateWebhookEndpoint(user, id, fields);
  revalidatePath("/admin/webhooks");
  return `Saved “${after.description}”.`;
});

export const setWebhookEndpointActiveAction = formAction({ action: "webhooks.manage", schema: webhookEndpointActiveSchema }, async ({ user, input }) => {
  const after = setWebhookEndpointActive(user, input.id, input.active);
  revalidatePath("/admin/webhooks");
  if (after.active) kickWebhooks();
  return after.active ? `Resumed “${after.description}”: waiting deliveries go out now.` : `Paused “${after.description}”: nothing is sent to it, and new events are not queued for it.`;
});

/** Answers with the new secret: shown this once. */
export const rotateWebhookSecretAction = formAction({ action: "webhooks.manage", schema: webhookEndpointIdSchema }, async ({ user, input }) => {
  const { secret } = rotateWebhookSecret(user, input.id);
  revalidatePath("/admin/webhooks");
  return secret;
});

export const retryWebhookDeliveryAction = formAction({ action: "webhooks.manage", schema: webhookDeliveryIdSchema }, async ({ user, input }) => {
  const after = retryWebhookDelivery(user, input.id);
  revalidatePath("/admin/webhooks");
  if (!after.endpointActive) return "Queued again; it is sent once its endpoint is resumed.";
  kickWebhooks();
  return "Sending it again now.";
});
