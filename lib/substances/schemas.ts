import { z } from "zod";
import { listQuerySchema } from "@/lib/http/list-query";

export const substanceListQuerySchema = listQuerySchema({
  sortable: ["name", "cas", "normalBoilingPointC", "flashPointC", "lflVolPercent", "molarMassGPerMol"],
  defaultSort: "name",
  filters: {
    q: z.string().trim().max(200, "q is at most 200 characters.").optional(),
    cas: z
      .string()
      .trim()
      .regex(/^\d{2,7}-\d{2}-\d$/, "cas must look like 67-64-1.")
      .optional(),
    ghs: z.enum(["1", "2", "3", "4", "none"], { error: "ghs must be 1, 2, 3, 4 or none." }).optional(),
  },
});

const TEMP_REQUIRED = "tempC is required, in °C (for example tempC=20).";

export const vaporPressureQuerySchema = z.object({
  tempC: z
    .string({ error: TEMP_REQUIRED })
    .trim()
    .min(1, TEMP_REQUIRED)
    .transform(Number)
    .refine(Number.isFinite, "tempC must be a number, in °C.")
    .refine((t) => t > -273.15, "tempC must be above absolute zero (−273.15 °C).")
    .refine((t) => t <= 500, "tempC above 500 °C is outside what Headroom assesses."),
  ambientPressureKPa: z
    .string()
    .optional()
    .transform((v) => (v === undefined || v.trim() === "" ? undefined : Number(v)))
    .refine((p) => p === undefined || Number.isFinite(p), "ambientPressureKPa must be a number, in kPa.")
    .refine((p) => p === undefined || (p >= 50 && p <= 120), "ambientPressureKPa must be between 50 and 120 kPa."),
});
