/** Container schemas shared by the container form, the server actions and the JSON API. */
import { z } from "zod";
import { AMOUNT_UNITS, CONTAINER_KINDS, CONTAINER_STATES } from "@/db/enums";
import { listQuerySchema } from "@/lib/http/list-query";
import { optionalDate, optionalId, optionalNumber, optionalText, requiredId, requiredNumber } from "@/lib/validation/fields";

const VOLUME_UNITS = new Set(["mL", "L"]);
const TO_BASE: Record<string, number> = { mL: 1e-3, L: 1, g: 1e-3, kg: 1 };

export function sameDimension(a: string, b: string): boolean {
  return VOLUME_UNITS.has(a) === VOLUME_UNITS.has(b);
}

/** Amount in L (volumes) or kg (masses), for comparisons. */
export function toBaseAmount(amount: number, unit: string): number {
  return amount * (TO_BASE[unit] ?? Number.NaN);
}

const label = z
  .string({ error: "Enter the container's label or scan its barcode." })
  .trim()
  .min(1, "Enter the container's label or scan its barcode.")
  .max(64, "A label is at most 64 characters.")
  .regex(/^[\x21-\x7E](?:[\x20-\x7E]*[\x21-\x7E])?$/, "A label may use printable ASCII characters only (as barcodes do).");

/** A container's amount; the what-if takes the same limits. */
export const containerAmountSchema = requiredNumber({ label: "Amount", min: 0, max: 1e6 });

const containerFields = {
  label,
  substanceId: optionalId("substance"),
  mixtureId: optionalId("mixture"),
  amount: containerAmountSchema,
  amountUnit: z.enum(AMOUNT_UNITS, { error: "Choose mL, L, g or kg." }),
  capacity: optionalNumber({ label: "Capacity", exclusiveMin: 0, max: 1e6 }),
  capacityUnit: z.union([z.enum(AMOUNT_UNITS), z.literal(""), z.null()]).optional().transform((v) => (v === "" ? null : v)),
  containerKind: z.enum(CONTAINER_KINDS, { error: "Choose the kind of container." }).optional(),
  state: z.enum(CONTAINER_STATES, { error: "Choose a state." }).optional(),
  storageUnitId: requiredId("storage unit"),
  ownerId: optionalId("owner"),
  receivedAt: optionalDate("Received on"),
  openedAt: optionalDate("Opened on"),
  expiresAt: optionalDate("Expires on"),
  notes: optionalText("Notes"),
};

type Shape = {
  substanceId?: number | null;
  mixtureId?: number | null;
  amount?: number;
  amountUnit?: string;
  capacity?: number | null;
  capacityUnit?: string | null;
  receivedAt?: number | null;
  openedAt?: number | null;
};

/** Cross-field rules; `partial` skips the ones whose fields an update leaves out. */
export function checkContainerRules(value: Shape, ctx: z.RefinementCtx, partial = false): void {
  const hasSubstance = value.substanceId != null;
  const hasMixture = value.mixtureId != null;
  if (!partial || value.substanceId !== undefined || value.mixtureId !== undefined) {
    if (hasSubstance && hasMixture) ctx.addIssue({ code: "custom", path: ["substanceId"], message: "Choose a substance or a mixture, not both." });
    if (!partial && !hasSubstance && !hasMixture) ctx.addIssue({ code: "custom", path: ["substanceId"], message: "Choose what the container holds: a substance or a mixture." });
  }
  if (value.capacity != null && !value.capacityUnit) ctx.addIssue({ code: "custom", path: ["capacityUnit"], message: "Give the capacity's unit." });
  if (value.capacity != null && value.capacityUnit && value.amount != null && value.amountUnit) {
    if (!sameDimension(value.amountUnit, value.capacityUnit)) {
      ctx.addIssue({ code: "custom", path: ["capacityUnit"], message: "Give amount and capacity both as volumes (mL, L) or both as masses (g, kg)." });
    } else if (toBaseAmount(value.amount, value.amountUnit) > toBaseAmount(value.capacity, value.capacityUnit) * (1 + 1e-9)) {
      ctx.addIssue({ code: "custom", path: ["amount"], message: "The amount is more than the container's capacity." });
    }
  }
  if (value.receivedAt != null && value.openedAt != null && value.openedAt < value.receivedAt) {
    ctx.addIssue({ code: "custom", path: ["openedAt"], message: "A container cannot be opened before it was received." });
  }
}

export const containerCreateSchema = z.object(containerFields).superRefine((v, ctx) => checkContainerRules(v, ctx));
export const containerUpdateSchema = z
  .object(containerFields)
  .omit({ storageUnitId: true })
  .partial()
  .superRefine((v, ctx) => checkContainerRules(v, ctx, true));
/** The edit form: the update fields plus the container's id. */
export const containerEditFormSchema = z
  .object(containerFields)
  .omit({ storageUnitId: true })
  .partial()
  .extend({ id: requiredId("container") })
  .superRefine((v, ctx) => checkContainerRules(v, ctx, true));
export const containerMoveSchema = z.object({ storageUnitId: requiredId("storage unit") });
export const containerStateSchema = z.object({ state: z.enum(CONTAINER_STATES, { error: "Choose a state." }) });

export type ContainerCreateInput = z.output<typeof containerCreateSchema>;
export type ContainerUpdateInput = z.output<typeof containerUpdateSchema>;

export const CONTAINER_SORTABLE = ["label", "substance", "amount", "state", "location", "owner", "updatedAt", "expiresAt"] as const;

const optionalFilterId = z
  .string()
  .optional()
  .transform((v) => (v === undefined || v === "" ? undefined : Number(v)))
  .refine((v) => v === undefined || (Number.isInteger(v) && v > 0), "Must be a positive whole number.");

/** GET /api/v1/containers: paging, sorting and filters. */
export const containerListQuerySchema = listQuerySchema({
  sortable: CONTAINER_SORTABLE,
  defaultSort: "updatedAt",
  defaultDir: "desc",
  filters: {
    q: z.string().trim().max(100, "q is at most 100 characters.").optional(),
    state: z.enum([...CONTAINER_STATES, "live", "all"], { error: "state must be one of sealed, opened, in_use, empty, disposed, live or all." }).optional(),
    siteId: optionalFilterId,
    roomId: optionalFilterId,
    storageUnitId: optionalFilterId,
    ownerId: optionalFilterId,
    substanceId: optionalFilterId,
    mine: z.enum(["1", "0", "true", "false"]).optional().transform((v) => v === "1" || v === "true"),
  },
});
export type ContainerListQuery = z.output<typeof containerListQuerySchema>;
