/** The stored codes of Headroom's enumerations. Pure, so forms and the client may import them. */

export const ALERT_DELIVERIES = ["immediate", "digest", "off"] as const;
export type AlertDelivery = (typeof ALERT_DELIVERIES)[number];

export const USER_TOKEN_KINDS = ["invitation", "password_reset"] as const;
export type UserTokenKind = (typeof USER_TOKEN_KINDS)[number];

export const ROOM_KINDS = ["storeroom", "laboratory", "cold_room", "corridor", "other"] as const;
export type RoomKind = (typeof ROOM_KINDS)[number];

export const STORAGE_UNIT_KINDS = [
  "open_shelving",
  "flammable_cabinet",
  "corrosives_cabinet",
  "ventilated_cabinet",
  "domestic_refrigerator",
  "flammable_storage_refrigerator",
  "explosion_proof_refrigerator",
  "freezer_minus_20",
  "freezer_minus_80",
  "cryogen_area",
  "fume_hood",
  "other",
] as const;
export type StorageUnitKind = (typeof STORAGE_UNIT_KINDS)[number];

export const PHYSICAL_STATES = ["liquid", "solid", "cryogen", "gas"] as const;

export const EXPOSURE_LIMIT_KINDS = ["TWA", "STEL", "ceiling", "IDLH"] as const;

export const EXPOSURE_LIMIT_UNITS = ["ppm", "mg/m3"] as const;

export const FRACTION_BASES = ["mass", "mole"] as const;

export const AMOUNT_UNITS = ["mL", "L", "g", "kg"] as const;
export type AmountUnit = (typeof AMOUNT_UNITS)[number];

export const CONTAINER_KINDS = [
  "glass_bottle",
  "plastic_bottle",
  "metal_can",
  "safety_can",
  "carboy",
  "drum",
  "ampoule",
  "vial",
  "dewar",
  "gas_cylinder",
  "bag",
  "other",
] as const;

export const CONTAINER_STATES = ["sealed", "opened", "in_use", "empty", "disposed"] as const;
export type ContainerState = (typeof CONTAINER_STATES)[number];

export const SEVERITIES = ["critical", "high", "moderate", "low"] as const;
export type Severity = (typeof SEVERITIES)[number];

export const FINDING_STATUSES = ["open", "acknowledged", "mitigating", "resolved", "risk_accepted"] as const;
export type FindingStatus = (typeof FINDING_STATUSES)[number];

export const SCENARIOS = ["room_worst_case", "in_control", "control_lost", "spill"] as const;
export type Scenario = (typeof SCENARIOS)[number];

export const FINDING_EVENT_KINDS = [
  "raised",
  "updated",
  "acknowledged",
  "mitigation_started",
  "resolved",
  "auto_resolved",
  "reopened",
  "risk_accepted",
  "comment",
  "assigned",
] as const;

export const EMAIL_STATUSES = ["queued", "sending", "sent"] as const;

export const LIQUID_CLASSES = ["IA", "IB", "IC", "II", "IIIA", "IIIB"] as const;
export type LiquidClass = (typeof LIQUID_CLASSES)[number];

export const QUANTITY_LIMIT_SCOPES = ["room", "flammable_cabinet", "storage_unit"] as const;

export const JOB_STATUSES = ["queued", "running", "done", "failed"] as const;
