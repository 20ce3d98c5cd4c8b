/** The register workbook's query string: an optional site. */
import { z } from "zod";

export const registerExportQuerySchema = z.object({
  siteId: z
    .string()
    .optional()
    .transform((v) => (v === undefined || v.trim() === "" ? undefined : Number(v)))
    .refine((v) => v === undefined || (Number.isInteger(v) && v > 0), "siteId must be a positive whole number."),
});
export type RegisterExportQuery = z.output<typeof registerExportQuerySchema>;
