import { z } from "zod";

/** page (1-based) and pageSize (1–100, default 25) from a query string. */
export const pagingSchema = z.object({
  page: z.coerce.number({ error: "page must be a whole number from 1." }).int("page must be a whole number from 1.").min(1, "page must be a whole number from 1.").default(1),
  pageSize: z.coerce
    .number({ error: "pageSize must be a whole number from 1 to 100." })
    .int("pageSize must be a whole number from 1 to 100.")
    .min(1, "pageSize must be a whole number from 1 to 100.")
    .max(100, "pageSize must be a whole number from 1 to 100.")
    .default(25),
});

export function idParam(raw: string | undefined): number | null {
  if (!raw || !/^\d{1,12}$/.test(raw)) return null;
  const id = Number(raw);
  return id > 0 ? id : null;
}
