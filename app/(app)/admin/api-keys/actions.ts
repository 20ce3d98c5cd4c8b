"use server";
import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/auth/form-action";
import { apiKeyCreateFormSchema, apiKeyRevokeSchema } from "@/lib/api-keys/schemas";
import { createApiKey, revokeApiKey } from "@/lib/api-keys/service";

/** Answers with the new key itself as the message: the form shows it this once; only its hash is stored. */
export const createApiKeyAction = formAction({ action: "apiKeys.manage", schema: apiKeyCreateFormSchema }, async ({ user, input }) => {
  const { key } = createApiKey(user, input);
  revalidatePath("/admin/api-keys");
  return key;
});

export const revokeApiKeyAction = formAction({ action: "apiKeys.manage", schema: apiKeyRevokeSchema }, async ({ user, input }) => {
  const revoked = revokeApiKey(user, input.id);
  revalidatePath("/admin/api-keys");
  return `Revoked “${revoked.name}”. Loggers using it are refused from now on.`;
});
