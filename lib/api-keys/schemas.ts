import { z } from "zod";
import { requiredText } from "@/lib/validation/fields";
import { API_KEY_SCOPES } from "./scopes";

export const apiKeyCreateSchema = z.object({
  name: requiredText("Name", 80),
  scopes: z.array(z.enum(API_KEY_SCOPES, { error: `Scopes are: ${API_KEY_SCOPES.join(", ")}.` })).min(1, "Give the key at least one scope.").default(["readings:write"]),
});
