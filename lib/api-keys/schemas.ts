import { z } from "zod";
import { requiredText } from "@/lib/validation/fields";
import { API_KEY_SCOPES } from "./scopes";

export const apiKeyCreateSchema = z.object({
  name: requiredText("Name", 80),
  scopes: z.array(z.enum(API_KEY_SCOPES, { error: `Scopes are: ${API_KEY_SCOPES.join(", ")}.` })).min(1, "Give the key at least one scope.").default(["readings:write"]),
});

/** The admin form ticks scopes explicitly: none ticked is an error, not the default. */
export const apiKeyCreateFormSchema = apiKeyCreateSchema.extend({
  scopes: z
    .array(z.enum(API_KEY_SCOPES, { error: `Scopes are: ${API_KEY_SCOPES.join(", ")}.` }), { error: "Tick at least one scope." })
    .min(1, "Tick at least one scope."),
});

export const apiKeyRevokeSchema = z.object({ id: z.coerce.number({ error: "Choose a key." }).int().positive("Choose a key.") });
