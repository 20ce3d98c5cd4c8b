/**
 * The plain snapshots the assessment rules read, the settings they apply and the findings they
 * propose. Pure data: the assessment service builds a snapshot from stored rows, the rules never see the
 * database.
 */
import type { AmountUnit, ContainerState, LiquidClass, RoomKind, Scenario, Severity, StorageUnitKind } from "@/db/enums";
import type { ExposureLimit, ExposureLimitKind, GhsFlammableCategory, NfpaLiquidClass, Trace, VaporProperties } from "@/lib/hazard";
import type { WorstCase } from "@/lib/temperatures/worst-case";
import type { RuleId } from "./rule-ids";

export type PhysicalState = "liquid" | "solid" | "cryogen" | "gas";

// ---------------------------------------------------------------------------------------------
// What is stored
// ---------------------------------------------------------------------------------------------

/**
 * One substance as the rules see it. Build it once per substance with `buildSubstanceSnapshot`
 * and share the same object between every container and location that holds it: `props` is the
 * engine's input, compiled by the engine on first use and then treated as immutable, and the
 * assessment cache keys on the object.
 */
export type SubstanceSnapshot = {
  readonly id: number;
  readonly name: string;
  readonly cas: string | null;
  readonly physicalState: PhysicalState;
  readonly props: VaporProperties;
  readonly molarMassGPerMol: number;
  /** True when at least one vapor-pressure correlation (Antoine or DIPPR-101) is stored. */
  readonly hasCorrelation: boolean;
  readonly normalBoilingPointC: number | null;
  /** Closed cup. Null for a substance that does not flash, or whose flash point is not recorded. */
  readonly flashPointC: number | null;
  readonly lflVolPercent: number | null;
  readonly liquidDensityKgPerM3: number | null;
  readonly exposureLimits: readonly ExposureLimit[];
  /** From flash point and normal boiling point (null when either is missing or FP > 93 °C). */
  readonly ghsCategory: GhsFlammableCategory | null;
  readonly nfpaClass: NfpaLiquidClass | null;
  /** Source of each stored value, by field name (the substance library's `sources`). */
  readonly sources: Readonly<Record<string, string>>;
};

export type MixtureComponentSnapshot = {
  readonly substance: SubstanceSnapshot;
  /** Liquid mole fraction, normalised over the listed components. */
  readonly moleFraction: number;
  /** Mass fraction, normalised over the listed components. */
  readonly massFraction: number;
};

/** A mixture with its components, built once with `buildMixtureSnapshot`. */
export type MixtureSnapshot = {
  readonly id: number;
  readonly name: string;
  readonly components: readonly MixtureComponentSnapshot[];
  /** The flash point used for classification and the flash-point rule. */
  readonly flashPointC: number | null;
  /** "measured": a measured or SDS value was given; "lowest-component": the lowest component flash point (a screening value). */
  readonly flashPointBasis: "measured" | "lowest-component" | null;
  /** The lowest component boiling point, a lower bound of the initial boiling point, for classification. */
  readonly boilingPointC: number | null;
  readonly ghsCategory: GhsFlammableCategory | null;
  readonly nfpaClass: NfpaLiquidClass | null;
  /** Ideal mixing of the component densities (1/ρ = Σ wᵢ/ρᵢ); null when a component's density is missing. */
  readonly liquidDensityKgPerM3: number | null;
  /** Notes about the snapshot itself (fractions normalised, flash point estimated…). */
  readonly warnings: readonly string[];
};

export type StoredContent =
  | { readonly kind: "substance"; readonly substance: SubstanceSnapshot }
  | { readonly kind: "mixture"; readonly mixture: MixtureSnapshot };

/** One container as stored (volatile liquids, cryogens and dry ice alike). */
export type StoredLiquid = {
  readonly containerId: number;
  readonly label: string;
  readonly content: StoredContent;
  /** The amount as entered; the rules turn it into litres and grams with the liquid density. */
  readonly amount: number;
  readonly amountUnit: AmountUnit;
  /** "opened" and "in_use" count as open; "empty" and "disposed" are left out. */
  readonly state: ContainerState;
};

// ---------------------------------------------------------------------------------------------
// Where it is stored
// ---------------------------------------------------------------------------------------------

export type RoomInfo = {
  readonly id: number;
  readonly siteId: number;
  readonly code: string;
  readonly name: string;
  readonly kind: RoomKind;
  /** Floor area × height; null when either is missing. */
  readonly volumeM3: number | null;
  /** Caps the area a spill can spread to. */
  readonly floorAreaM2: number | null;
  /** Null when unknown: the room is then assessed as unventilated (and the gap is reported). */
  readonly airChangesPerHour: number | null;
  /** Well-mixed room mixing factor k, multiplying the ventilation rate (0 < k ≤ 1). */
  readonly mixingFactor: number;
  readonly sprinklered: boolean;
  /** The site's local atmospheric pressure. */
  readonly atmosphericPressureKPa: number;
  readonly worstCase: WorstCase | null;
};

/** A unit's warm-up time constant τ (Newton's law of heating) with where it comes from, as a sentence for traces. */
export type UnitWarmUpInfo = { readonly tauMin: number; readonly source: "fitted" | "default" | "set"; readonly reason: string };

/**
 * Control-lost findings: minutes after a failure at which the contents reach the finding's severity
 * (0: already at the in-control worst case), the threshold's short label and its temperature.
 */
export type TimeToDanger = { readonly minutes: number; readonly threshold: string; readonly tempC: number };

export type UnitInfo = {
  readonly id: number;
  readonly code: string;
  readonly name: string;
  readonly kind: StorageUnitKind;
  readonly internalVolumeL: number | null;
  readonly ventilated: boolean;
  readonly ignitionSourceFree: boolean;
  /** Null for a unit without temperature control. */
  readonly setRange: { readonly minC: number | null; readonly maxC: number | null } | null;
  /** Temperature-controlled units: the warm-up time constant after a failure (set, fitted or default), for the time to danger. */
  readonly warmUp?: UnitWarmUpInfo | null;
  readonly worstCase: {
    /** The unit's own worst case. For a unit without temperature control, null means "use the room's". */
    readonly inControl: WorstCase | null;
    /** A controlled unit failed and warmed up to its room (see controlLostWorstCase); ignored without control. */
    readonly controlLost: WorstCase | null;
  };
};

/**
 * What one assessment run looks at. A room snapshot holds every container in the room's units
 * (spills, the room's enclosure bound, room quantity limits, cryogens); a unit snapshot holds the
 * unit's own containers and its room for context.
 */
export type LocationSnapshot =
  | { readonly kind: "room"; readonly room: RoomInfo; readonly contents: readonly StoredLiquid[] }
  | { readonly kind: "unit"; readonly unit: UnitInfo; readonly room: RoomInfo; readonly contents: readonly StoredLiquid[] };

// ---------------------------------------------------------------------------------------------
// Settings
// ---------------------------------------------------------------------------------------------

/** One configured quantity limit (a row of the organisation's own table). */
export type QuantityLimitSetting = {
  /** Stable id (the stored row's id): part of the finding's fingerprint. */
  readonly id: number | string;
  readonly name: string;
  /** "room": totals of the whole room; "flammable_cabinet": each flammable-liquid cabinet; "storage_unit": every unit. */
  readonly scope: "room" | "flammable_cabinet" | "storage_unit";
  readonly liquidClasses: readonly LiquidClass[];
  readonly maxVolumeL: number;
  /** Applies instead of maxVolumeL when the room is sprinklered, if the code gives an allowance. */
  readonly sprinkleredMaxVolumeL: number | null;
  /** The code, edition and clause the row comes from. */
  readonly basis: string;
};

export type CarbonDioxideLimitSetting = {
  readonly kind: ExposureLimitKind;
  readonly valuePpm: number;
  readonly body: string;
  readonly source: string;
};

export type MissingDataKind =
  | "no-vapor-pressure-method"
  | "no-correlation"
  | "no-lfl"
  | "no-flash-point"
  | "no-room-volume"
  | "no-air-changes"
  | "no-unit-volume"
  | "no-worst-case"
  | "no-density"
  | "no-exposure-limit"
  | "no-expansion-data"
  | "calculation-failed";

/**
 * Everything a safety officer can change. Every group carries the `source` of its values; the
 * defaults say where they come from and that they are defaults.
 */
export type AssessmentSettings = {
  /** Fractions of the LFL (0.10 = 10 % LFL) reached at or above which a finding has that severity. */
  readonly lfl: {
    readonly moderate: number;
    readonly high: number;
    readonly critical: number;
    /**
     * The most an enclosure finding can be inside a unit whose interior is free of ignition sources
     * (a rated cabinet, a flammable-storage or explosion-proof refrigerator): the vapor there has
     * nothing to ignite it until it escapes. "critical" treats such units like any other.
     */
    readonly ignitionFreeMaxSeverity: Severity;
    readonly source: string;
  };
  readonly flashPoint: {
    /** A worst case within this many °C below the flash point is flagged too. */
    readonly marginC: number;
    readonly atOrAboveSeverity: Severity;
    readonly withinMarginSeverity: Severity;
    /**
     * The severity of a liquid at or above (or near) its flash point inside a closed unit whose
     * interior is free of ignition sources (a rated cabinet, a flammable-storage or
     * explosion-proof refrigerator): information — the unit is built for exactly that — unless
     * the rule's own grade is lower. The enclosure rule grades the vapor itself.
     */
    readonly ignitionFreeSeverity: Severity;
    readonly source: string;
  };
  readonly boilingPoint: { readonly severity: Severity; readonly source: string };
  readonly ignitionSource: {
    /** GHS category 1–2 or NFPA class IA–IB. */
    readonly category1And2Severity: Severity;
    /** GHS category 3 or NFPA class IC. */
    readonly category3Severity: Severity;
    readonly source: string;
  };
  readonly exposure: {
    /** Fraction of the TWA at or above which a low finding is raised (an action level); null for none. */
    readonly twaActionFraction: number | null;
    readonly actionSeverity: Severity;
    /** Severity when the concentration exceeds a limit of this kind. */
    readonly twaSeverity: Severity;
    readonly stelSeverity: Severity;
    readonly ceilingSeverity: Severity;
    readonly idlhSeverity: Severity;
    /** Substances that have no exposure limit by nature (e.g. water): no missing-data finding for them. */
    readonly noLimitNeededCas: readonly string[];
    readonly source: string;
  };
  readonly spill: {
    readonly poolDepthM: number;
    /** Cap the pool at the room's floor area. */
    readonly limitPoolToFloorArea: boolean;
    /** Air speed over the pool. */
    readonly airSpeedMPerS: number;
    /** The short-term window: STEL, ceiling and IDLH are compared with the highest concentration in it. */
    readonly durationMin: number;
    readonly evaporationModel: "epa-rmp" | "mackay-matsugu";
    /** Gas-phase Schmidt number for the Mackay–Matsugu correlation. */
    readonly schmidtNumber: number;
    readonly source: string;
  };
  readonly quantities: {
    /** Fraction of a limit at or above which a low finding is raised; null for none. */
    readonly warnFraction: number | null;
    readonly warnSeverity: Severity;
    readonly exceededSeverity: Severity;
    readonly limits: readonly QuantityLimitSetting[];
    readonly source: string;
  };
  readonly oxygen: {
    readonly baselinePercent: number;
    /** Below this the atmosphere is oxygen-deficient. */
    readonly deficiencyPercent: number;
    /** Below this, evacuate. */
    readonly evacuatePercent: number;
    readonly deficiencySeverity: Severity;
    readonly evacuateSeverity: Severity;
    /** Reference temperature of the liquid-to-gas expansion (gas volume at this temperature). */
    readonly expansionReferenceTempC: number;
    readonly source: string;
  };
  readonly carbonDioxide: { readonly limits: readonly CarbonDioxideLimitSetting[]; readonly source: string };
  readonly missingData: { readonly severities: Readonly<Record<MissingDataKind, Severity>>; readonly source: string };
};

// ---------------------------------------------------------------------------------------------
// What the rules propose
// ---------------------------------------------------------------------------------------------

/**
 * A finding's calculation trace: the rule's own inputs and steps (limit, ratio, the severity
 * thresholds used) on top, and the engine's traces, unchanged, in `parts` in the order they were
 * used. Plain data, stored as JSON.
 */
export type FindingTrace = Trace & {
  readonly rule: RuleId;
  readonly scenario: Scenario;
  readonly parts: readonly Trace[];
  /** Every container the finding concerns, as the assessment saw it (the finding page lists them). */
  readonly containers?: readonly TraceContainer[];
  /** Control-lost findings: each severity threshold on the way up, its temperature and when after a failure it is reached (time-to-danger.ts). */
  readonly crossings?: readonly { readonly severity: Severity; readonly threshold: string; readonly tempC: number; readonly minutes: number | null }[];
};

/** One contributing container in a finding's trace: what the rules read of it. */
export type TraceContainer = {
  readonly containerId: number;
  readonly label: string;
  /** The substance's or mixture's name. */
  readonly content: string;
  readonly substanceId: number | null;
  readonly mixtureId: number | null;
  readonly amount: number;
  readonly amountUnit: AmountUnit;
  readonly state: ContainerState;
  /** The amount in litres and grams with the liquid density; null where the density is missing. */
  readonly volumeL: number | null;
  readonly massG: number | null;
};

/** A finding's data, all plain properties (what `CandidateFinding.toPlain()` returns). */
export type PlainCandidateFinding = {
  /** rule + location + subject (substance, mixture, limit…) + scenario; see fingerprint.ts. */
  readonly fingerprint: string;
  readonly rule: RuleId;
  readonly severity: Severity;
  readonly scenario: Scenario;
  readonly title: string;
  readonly siteId: number;
  readonly roomId: number;
  readonly storageUnitId: number | null;
  /** The container the finding turns on (the largest of the substance); null for a location-wide finding. */
  readonly containerId: number | null;
  readonly substanceId: number | null;
  readonly mixtureId: number | null;
  readonly value: number | null;
  readonly limitValue: number | null;
  /**
   * Above 1 the limit is crossed: value/limit, or limit/value for a lower limit such as oxygen.
   * Null for temperature comparisons and missing data.
   */
  readonly ratio: number | null;
  /** Unit of value and limitValue: "% LFL", "ppm", "% O₂", "L", "°C", "index". */
  readonly unit: string | null;
  readonly worstCaseTempC: number | null;
  readonly worstCaseSource: string | null;
  /** Control-lost findings at a unit with a warm-up: when after a failure the finding's severity is reached; null otherwise. */
  readonly timeToDanger: TimeToDanger | null;
  /** The calculation trace. */
  readonly trace: FindingTrace;
  /** Every container the finding concerns (for visibility and alerts). */
  readonly containerIds: number[];
};

/**
 * A finding as the rules propose it. `trace` is built on first read (a memoised getter), so a
 * re-assessment that finds a finding unchanged costs nothing to trace. JSON.stringify includes
 * it (toJSON); to copy a finding use `toPlain()` — an object spread leaves the getter behind.
 */
export interface CandidateFinding extends PlainCandidateFinding {
  toPlain(): PlainCandidateFinding;
  toJSON(): PlainCandidateFinding;
}
