/** Plain-word labels for stored codes. */
import type { RoomKind, StorageUnitKind } from "@/db/enums";

export const STORAGE_UNIT_KIND_LABELS: Record<StorageUnitKind, string> = {
  open_shelving: "Open shelving",
  flammable_cabinet: "Flammable-liquid cabinet",
  corrosives_cabinet: "Corrosives cabinet",
  ventilated_cabinet: "Ventilated cabinet",
  domestic_refrigerator: "Domestic-type refrigerator",
  flammable_storage_refrigerator: "Flammable-storage refrigerator",
  explosion_proof_refrigerator: "Explosion-proof refrigerator",
  freezer_minus_20: "−20 °C freezer",
  freezer_minus_80: "−80 °C freezer",
  cryogen_area: "Cryogen area",
  fume_hood: "Fume hood",
  other: "Other",
};

export const ROOM_KIND_LABELS: Record<RoomKind, string> = {
  storeroom: "Storeroom",
  laboratory: "Laboratory",
  cold_room: "Walk-in cold room",
  corridor: "Corridor",
  other: "Other",
};

export const VAPOR_METHOD_LABELS: Record<string, string> = {
  antoine: "Antoine equation",
  dippr101: "DIPPR 101 equation",
  wagner: "Wagner equation",
  "clausius-clapeyron": "Clausius–Clapeyron from the boiling point",
  "clausius-clapeyron-trouton": "Clausius–Clapeyron with Trouton's rule (estimate)",
};
