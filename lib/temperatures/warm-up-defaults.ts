/**
 * The default warm-up time constant τ of each kind of temperature-controlled unit, used until the
 * unit has a usable recorded failure of its own (a fit) or a person sets one. Each default carries
 * its reasoning and its source, shown on the thresholds page beside the other defaults. Pure.
 *
 * How a holding time becomes τ (Newton's law of heating, T(t) = T_room − (T_room − T_start)·e^(−t/τ)):
 * a unit that stays below a limit T_limit for a time t after its cooling stops has
 * τ = t / ln((T_room − T_start) / (T_room − T_limit)). While the limit lies less than 63 % of the way
 * from the start to the room, the logarithm is below 1 and τ is longer than t. Taking τ = t is
 * therefore a lower bound: it warms the unit faster than the holding time implies, and a shorter τ
 * brings every time to danger forward — the cautious side.
 */
import type { StorageUnitKind } from "@/db/enums";

export type WarmUpDefault = {
  /** The kind it applies to, or "controlled_other" for any other unit with a set range (a walk-in cold room, a controlled cabinet). */
  kind: StorageUnitKind | "controlled_other";
  /** What people call it. */
  label: string;
  tauMin: number;
  reasoning: string;
  source: string;
};

const FOOD_SAFETY_SOURCE =
  "USDA Food Safety and Inspection Service, “Keeping Food Safe During an Emergency” (fact sheet; the same figures on FoodSafety.gov): a closed refrigerator keeps food safe (at or below 40 °F, 4 °C) for about 4 hours without power; a full freezer holds its temperature for about 48 hours, a half-full one for about 24 hours, if the door stays closed.";

/** How a published holding time becomes τ, shown once beside the defaults. */
export const HOLDING_TIME_TO_TAU =
  "By Newton's law, a unit that stays below a limit T_limit for a time t after its cooling stops has τ = t / ln((T_room − T_start) / (T_room − T_limit)). While the limit lies less than 63 % of the way from the start to the room, the logarithm is below 1 and τ is longer than t. Taking τ equal to the holding time is therefore a lower bound: the unit is assumed to warm faster than the guidance implies, which brings every time to danger forward.";

const LOWER_BOUND = "Taken as τ, a lower bound (how a holding time becomes τ is explained above the table).";

const HOUR_MIN = 60;

/** τ for people, in hours and minutes: "4 h", "3 h 10 min", "24 h", "45 min". */
export function formatTauMin(tauMin: number): string {
  const total = Math.max(0, Math.round(tauMin));
  const hours = Math.floor(total / HOUR_MIN);
  const minutes = total % HOUR_MIN;
  if (hours === 0) return `${minutes} min`;
  return `${hours.toLocaleString("en-GB")} h${minutes ? ` ${minutes} min` : ""}`;
}

export const WARM_UP_DEFAULTS: readonly WarmUpDefault[] = [
  {
    kind: "domestic_refrigerator",
    label: "domestic-type refrigerator",
    tauMin: 4 * HOUR_MIN,
    reasoning: `A closed refrigerator holds 4 °C for about 4 hours without power. Run at 3 °C in a 20 °C room, the 4 °C limit is about 6 % of the way to the room. ${LOWER_BOUND}`,
    source: FOOD_SAFETY_SOURCE,
  },
  {
    kind: "flammable_storage_refrigerator",
    label: "flammable-storage refrigerator",
    tauMin: 4 * HOUR_MIN,
    reasoning: `Built like a domestic refrigerator as far as insulation and door seals go (what it adds is the absence of ignition sources inside), so it takes the refrigerator's holding time of about 4 hours. ${LOWER_BOUND}`,
    source: `${FOOD_SAFETY_SOURCE} Applying the refrigerator figure to laboratory refrigerators: common practice.`,
  },
  {
    kind: "explosion_proof_refrigerator",
    label: "explosion-proof refrigerator",
    tauMin: 4 * HOUR_MIN,
    reasoning: `Insulated like a refrigerator of its size; it takes the refrigerator's holding time of about 4 hours. ${LOWER_BOUND}`,
    source: `${FOOD_SAFETY_SOURCE} Applying the refrigerator figure to laboratory refrigerators: common practice.`,
  },
  {
    kind: "freezer_minus_20",
    label: "−20 °C freezer",
    tauMin: 24 * HOUR_MIN,
    reasoning: `A half-full freezer holds its temperature for about 24 hours (a full one about 48). Laboratory freezers are seldom packed full, and the shorter figure is the cautious one. From −18 °C in a 20 °C room, even a 0 °C limit is only 47 % of the way to the room. ${LOWER_BOUND}`,
    source: FOOD_SAFETY_SOURCE,
  },
  {
    kind: "freezer_minus_80",
    label: "−80 °C freezer",
    tauMin: 8 * HOUR_MIN,
    reasoning:
      "No published guidance gives a holding time for ultra-low freezers. Their insulation is thicker than a −20 °C freezer's, but a lightly loaded one has little frozen mass to hold it, and laboratories plan to move samples to a backup within hours of a failure. 8 hours is a third of the half-full −20 °C freezer's figure: the cautious side until the unit's own failures give a fit.",
    source: "Common practice (no published rule sets this value).",
  },
  {
    kind: "controlled_other",
    label: "unit with a set range (a walk-in cold room, a controlled cabinet)",
    tauMin: 4 * HOUR_MIN,
    reasoning: `No published holding time covers these units. A walk-in cold room has far more mass than a refrigerator and warms more slowly; taking the refrigerator's 4 hours is the cautious side. ${LOWER_BOUND}`,
    source: "Common practice (no published rule sets this value); the refrigerator figure is from the USDA Food Safety and Inspection Service fact sheet “Keeping Food Safe During an Emergency”.",
  },
];

const BY_KIND = new Map<string, WarmUpDefault>(WARM_UP_DEFAULTS.map((d) => [d.kind, d]));

/** The default for a temperature-controlled unit of this kind. */
export function warmUpDefaultFor(kind: StorageUnitKind): WarmUpDefault {
  return BY_KIND.get(kind) ?? (BY_KIND.get("controlled_other") as WarmUpDefault);
}

/** The sentence a trace quotes for a default τ. */
export function defaultWarmUpReason(kind: StorageUnitKind): string {
  const d = warmUpDefaultFor(kind);
  const first = d.reasoning.split(/(?<=\.) /)[0];
  return `τ = ${formatTauMin(d.tauMin)}, default for a ${d.label} (no usable recorded failure of this unit): ${first} Source: ${d.source}`;
}
