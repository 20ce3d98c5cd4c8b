import type { z } from "zod";

/**
 * An edit form sends every field it shows, and Conform reads an emptied field as absent. For the
 * server that reads absent as "unchanged", so emptying an optional field (a room's design maximum,
 * a substance's flash point) would silently keep the old value. Here a top-level field the form sent
 * empty, which the schema left undefined and which the schema itself accepts as null, becomes null:
 * "cleared". Fields the form did not send stay undefined (unchanged).
 */
export function withClearedFields<T>(schema: z.ZodType, formData: FormData, value: T): T {
  const shape = objectShape(schema);
  if (!shape || value === null || typeof value !== "object") return value;
  const out = { ...(value as Record<string, unknown>) };
  let changed = false;
  for (const key of new Set(formData.keys())) {
    if (!(key in shape) || out[key] !== undefined) continue;
    const sent = formData.getAll(key);
    if (!sent.every((v) => typeof v === "string" && v.trim() === "")) continue;
    const asNull = (shape[key] as z.ZodType).safeParse(null);
    if (asNull.success && asNull.data === null) {
      out[key] = null;
      changed = true;
    }
  }
  return changed ? (out as T) : value;
}

function objectShape(schema: z.ZodType): Record<string, unknown> | undefined {
  const candidate = schema as unknown as { shape?: Record<string, unknown> };
  return candidate.shape && typeof candidate.shape === "object" ? candidate.shape : undefined;
}
