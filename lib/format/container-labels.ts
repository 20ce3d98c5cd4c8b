/** Plain-word labels for container codes (client-safe). */
import type { CONTAINER_KINDS, CONTAINER_STATES } from "@/db/enums";

export { AMOUNT_UNITS } from "@/db/enums";

export const CONTAINER_KIND_LABELS: Record<(typeof CONTAINER_KINDS)[number], string> = {
  glass_bottle: "Glass bottle",
  plastic_bottle: "Plastic bottle",
  metal_can: "Metal can",
  safety_can: "Safety can",
  carboy: "Carboy",
  drum: "Drum",
  ampoule: "Ampoule",
  vial: "Vial",
  dewar: "Dewar",
  gas_cylinder: "Gas cylinder",
  bag: "Bag",
  other: "Other",
};

export const CONTAINER_STATE_LABELS: Record<(typeof CONTAINER_STATES)[number], string> = {
  sealed: "Sealed",
  opened: "Opened",
  in_use: "In use",
  empty: "Empty",
  disposed: "Disposed of",
};
