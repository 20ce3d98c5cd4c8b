/**
 * Default thresholds (each group with its source), the schema a settings form validates against,
 * and the functions that turn a rule's ratio into a severity.
 *
 * Edges, stated once: an LFL alarm fraction, an action level or a warning fraction is reached
 * AT OR ABOVE its value (as a gas detector alarms); an exposure or quantity limit is exceeded
 * only ABOVE it (the codes say "shall not exceed"); oxygen is deficient only BELOW its threshold
 * (OSHA: "below 19.5 percent").
 */
import { z } from "zod";
import { LIQUID_CLASSES, QUANTITY_LIMIT_SCOPES, SEVERITIES, type Severity } from "@/db/enums";
import {
  CARBON_DIOXIDE_NIOSH_LIMITS,
  NORMAL_AIR_OXYGEN_PERCENT,
  OXYGEN_DEFICIENCY_PERCENT,
  type ExposureLimitKind,
  type GhsFlammableCategory,
  type NfpaLiquidClass,
} from "@/lib/hazard";
import type { AssessmentSettings, MissingDataKind, QuantityLimitSetting } from "./types";

const DEFAULT_NOTE = "Default, set by your organisation.";
/** One US gallon, exactly 3.785411784 L (NIST Handbook 44). */
const LITRES_PER_US_GALLON = 3.785411784;

export const MISSING_DATA_KINDS = [
  "no-vapor-pressure-method",
  "no-correlation",
  "no-lfl",
  "no-flash-point",
  "no-room-volume",
  "no-air-changes",
  "no-unit-volume",
  "no-worst-case",
  "no-density",
  "no-exposure-limit",
  "no-expansion-data",
  "calculation-failed",
] as const satisfies readonly MissingDataKind[];

/** Example quantity limits. Each organisation replaces them with the rows of its own adopted code. */
export const EXAMPLE_QUANTITY_LIMITS: readonly QuantityLimitSetting[] = [
  {
    id: "example-cabinet-class-i-ii",
    name: "Flammable-liquid cabinet, Class I and II",
    scope: "flammable_cabinet",
    liquidClasses: ["IA", "IB", "IC", "II"],
    maxVolumeL: 60 * LITRES_PER_US_GALLON,
    sprinkleredMaxVolumeL: null,
    basis:
      "Example default: NFPA 30 (2008) §9.5 and OSHA 29 CFR 1910.106(d)(3)(i): not more than 60 gal (227 L) of Class I and II (Category 1–3) liquids in one storage cabinet. Replace with your adopted code's figure.",
  },
  {
    id: "example-cabinet-total",
    name: "Flammable-liquid cabinet, all liquids",
    scope: "flammable_cabinet",
    liquidClasses: ["IA", "IB", "IC", "II", "IIIA", "IIIB"],
    maxVolumeL: 120 * LITRES_PER_US_GALLON,
    sprinkleredMaxVolumeL: null,
    basis:
      "Example default: NFPA 30 (2008) §9.5 as summarised in NFPA Journal (Mar/Apr 2011): a cabinet can store up to 120 gal (454 L) of liquid. Replace with your adopted code's figure.",
  },
  {
    id: "example-room-class-i",
    name: "Control area, Class IA + IB + IC",
    scope: "room",
    liquidClasses: ["IA", "IB", "IC"],
    maxVolumeL: 120 * LITRES_PER_US_GALLON,
    sprinkleredMaxVolumeL: 240 * LITRES_PER_US_GALLON,
    basis:
      "Example default: IFC (2012) Table 5003.1.1(1), maximum allowable quantity per control area: 120 gal of Class IB flammable liquid (as adopted in the 2014 Indiana Fire Code). This example applies the 120 gal to Class IA, IB and IC together and doubles it in a fully sprinklered building; replace both with the table and footnotes of the edition your authority has adopted — the authority having jurisdiction decides. Counts liquids in cabinets too.",
  },
];

/** Every threshold the rules use, with where it comes from. All of them are defaults. */
export const DEFAULT_ASSESSMENT_SETTINGS: AssessmentSettings = {
  lfl: {
    moderate: 0.1,
    high: 0.25,
    critical: 1,
    ignitionFreeMaxSeverity: "high",
    source: `${DEFAULT_NOTE} 10 % LFL: OSHA 29 CFR 1910.146 (a hazardous atmosphere in a permit-required confined space has flammable vapor in excess of 10 % of its LFL) and the 10 % LEL criterion NIOSH added to its IDLH values in 1994. 25 % LFL: NYC Fire Code 502.9.5.1 (vapor detection shuts dispensing down at 25 % of the LFL), the usual ventilation design target and area-classification practice. 100 % LFL: the lower flammable limit itself — the vapor can burn. No single standard sets these alarm fractions; gas-detector defaults differ by maker. At most high inside a unit whose interior is free of ignition sources (a rated flammable-liquid cabinet, a flammable-storage or explosion-proof refrigerator): Headroom's own default, common practice rather than a published rule — such a unit is built so that nothing inside can ignite the vapor, which becomes a hazard once it escapes (door opened, spill); set it to critical to grade such units like any other.`,
  },
  flashPoint: {
    marginC: 10,
    atOrAboveSeverity: "moderate",
    withinMarginSeverity: "low",
    ignitionFreeSeverity: "low",
    source: `${DEFAULT_NOTE} Margin 10 °C: ASTM E502 says flammable vapor might be present from 5–10 °C below the closed-cup flash point; OSHA 29 CFR 1910.106(a)(19) handles a liquid heated to within 30 °F (16.7 °C) of its flash point as the next more hazardous category. NFPA 45 (2004) annex A.12.2.2.2.1: refrigerator temperatures are almost always above the flash points of the flammable liquids stored in them, and what makes a domestic refrigerator dangerous is the ignition sources in its compartment — so inside a closed unit whose interior is free of ignition sources (a flammable-storage or explosion-proof refrigerator, a closed flammable-liquid cabinet) the flash-point finding is information (low); the closed-space rule grades the vapor itself against the LFL. Moderate at or above the flash point elsewhere, and low for the margin: common practice.`,
  },
  boilingPoint: {
    severity: "high",
    source: `${DEFAULT_NOTE} At or above its boiling point at the site's pressure a liquid boils (Psat ≥ Patm) and a closed container can pressurise.`,
  },
  ignitionSource: {
    category1And2Severity: "critical",
    category3Severity: "high",
    source: `${DEFAULT_NOTE} NFPA 45 (2004) annex A.12.2.2.2.1: a domestic refrigerator has ignition sources (thermostats, light switches, heater strips) within or exposed to the storage compartment; NRC Prudent Practices in the Laboratory (1995, 2011): do not store flammable liquids in a refrigerator unless it is approved for such storage. Flammable liquid: GHS / OSHA 29 CFR 1910.106(a)(19) category 1–3 or NFPA 30 class I.`,
  },
  exposure: {
    twaActionFraction: 0.5,
    actionSeverity: "low",
    twaSeverity: "moderate",
    stelSeverity: "high",
    ceilingSeverity: "high",
    idlhSeverity: "critical",
    noLimitNeededCas: ["7732-18-5"],
    source: `${DEFAULT_NOTE} Limit kinds as OSHA 29 CFR 1910.1000 (TWA, ceiling) and NIOSH (REL TWA, 15-minute STEL, IDLH) define them; of several stored limits of one kind the most protective controls. Action level at half the TWA: common industrial-hygiene practice (e.g. OSHA 29 CFR 1910.1052, methylene chloride: action level 12.5 ppm against a PEL of 25 ppm). Water (CAS 7732-18-5) has no occupational exposure limit.`,
  },
  spill: {
    poolDepthM: 0.01,
    limitPoolToFloorArea: true,
    airSpeedMPerS: 0.1,
    durationMin: 15,
    evaporationModel: "epa-rmp",
    schmidtNumber: 1.5,
    source: `${DEFAULT_NOTE} Pool depth 1 cm for an undiked spill: US EPA RMP Offsite Consequence Analysis Guidance (EPA 550-B-99-009) and DOE-STD-3014-96. Evaporation: EPA RMP Eq. D-1. Air speed 0.1 m/s: laboratory air typically moves at about 20 ft/min (NRC Prudent Practices 1981, §I.H.1). 15 minutes: the STEL averaging period (NIOSH, OSHA) and the period over which OSHA assesses a ceiling. Schmidt number 1.5 (only for Mackay–Matsugu): common practice for organic vapors in air (Sc = ν/D: air about 1.5 × 10⁻⁵ m²/s over a vapor diffusivity of about 10⁻⁵ m²/s).`,
  },
  quantities: {
    warnFraction: 0.8,
    warnSeverity: "low",
    exceededSeverity: "high",
    limits: EXAMPLE_QUANTITY_LIMITS,
    source: `${DEFAULT_NOTE} The limits are examples only: quantity rules differ by code edition, jurisdiction, occupancy, floor and sprinklers, and the authority having jurisdiction decides. The 80 % early warning is Headroom's own default, with no published basis.`,
  },
  oxygen: {
    baselinePercent: NORMAL_AIR_OXYGEN_PERCENT,
    deficiencyPercent: OXYGEN_DEFICIENCY_PERCENT,
    evacuatePercent: 18,
    deficiencySeverity: "high",
    evacuateSeverity: "critical",
    expansionReferenceTempC: 20,
    source: `${DEFAULT_NOTE} 20.9 % O₂ in normal air. Below 19.5 % the atmosphere is oxygen-deficient (OSHA 29 CFR 1910.134(d)(2)(iii) and 1910.146). 18 %: the evacuation alarm of many oxygen monitors (oxygen-depletion guidance SOM036a: first warning at 19.5 %, second at 18 %). The whole inventory is released at once with no ventilation, the worst case BCGA GN11 recommends for risk assessment (Univ. of Oxford Safety Office Policy S4/03 App. 1); gas volumes at 20 °C (LN₂ ≈ 692 L of gas per litre from 806.5 kg/m³, UW-Madison data).`,
  },
  carbonDioxide: {
    limits: CARBON_DIOXIDE_NIOSH_LIMITS.map((limit) => ({
      kind: limit.kind,
      valuePpm: limit.value,
      body: limit.body ?? "NIOSH",
      source: limit.source ?? "NIOSH IDLH documentation for carbon dioxide (May 1994)",
    })),
    source: `${DEFAULT_NOTE} NIOSH IDLH documentation for carbon dioxide (May 1994): REL TWA 5,000 ppm, STEL 30,000 ppm, revised IDLH 40,000 ppm (the OSHA PEL is also 5,000 ppm TWA).`,
  },
  missingData: {
    severities: {
      "no-vapor-pressure-method": "moderate",
      "no-correlation": "low",
      "no-lfl": "moderate",
      "no-flash-point": "moderate",
      "no-room-volume": "moderate",
      "no-air-changes": "low",
      "no-unit-volume": "low",
      "no-worst-case": "moderate",
      "no-density": "low",
      "no-exposure-limit": "low",
      "no-expansion-data": "moderate",
      "calculation-failed": "moderate",
    },
    source: `${DEFAULT_NOTE} A gap that stops an assessment is moderate; one where a conservative estimate stands in (the saturation bound, a Clausius–Clapeyron estimate) is low.`,
  },
};

// ---------------------------------------------------------------------------------------------
// Schema (for the safety officer's settings form and the stored settings row)
// ---------------------------------------------------------------------------------------------

const severity = z.enum(SEVERITIES, { error: "Choose a severity: critical, high, moderate or low." });
const source = z.string().trim().min(1, "Say where the values come from.").max(4000, "At most 4000 characters.");
const fractionOfLimit = (label: string) =>
  z.number({ error: `${label} must be a number.` }).positive(`${label} must be above 0.`).max(10, `${label} must be at most 10 (1000 %).`);

const quantityLimitSchema = z
  .object({
    id: z.union([z.number().int(), z.string().trim().min(1).max(100)]),
    name: z.string().trim().min(1, "Name the limit.").max(200),
    scope: z.enum(QUANTITY_LIMIT_SCOPES),
    liquidClasses: z.array(z.enum(LIQUID_CLASSES)).min(1, "Choose at least one liquid class."),
    maxVolumeL: z.number().positive("The limit must be above 0 L.").max(1_000_000),
    sprinkleredMaxVolumeL: z.number().positive("The sprinklered limit must be above 0 L.").max(1_000_000).nullable(),
    basis: source,
  })
  .refine((limit) => limit.sprinkleredMaxVolumeL === null || limit.sprinkleredMaxVolumeL >= limit.maxVolumeL, {
    message: "The sprinklered limit cannot be below the unsprinklered one.",
    path: ["sprinkleredMaxVolumeL"],
  });

export const assessmentSettingsSchema: z.ZodType<AssessmentSettings> = z.object({
  lfl: z
    .object({
      moderate: fractionOfLimit("The moderate LFL fraction"),
      high: fractionOfLimit("The high LFL fraction"),
      critical: fractionOfLimit("The critical LFL fraction"),
      // Settings stored before this field existed keep their values and get the default.
      ignitionFreeMaxSeverity: severity.default("high"),
      source,
    })
    .refine((lfl) => lfl.moderate < lfl.high && lfl.high < lfl.critical, {
      message: "The LFL fractions must rise from moderate to high to critical.",
      path: ["high"],
    }),
  flashPoint: z.object({
    marginC: z.number().min(0, "The margin cannot be negative.").max(50, "The margin must be at most 50 °C."),
    atOrAboveSeverity: severity,
    withinMarginSeverity: severity,
    // Settings stored before this field existed keep their values and get the default.
    ignitionFreeSeverity: severity.default("low"),
    source,
  }),
  boilingPoint: z.object({ severity, source }),
  ignitionSource: z.object({ category1And2Severity: severity, category3Severity: severity, source }),
  exposure: z.object({
    twaActionFraction: z.number().gt(0, "The action level must be above 0.").lt(1, "The action level must be below the TWA (under 1).").nullable(),
    actionSeverity: severity,
    twaSeverity: severity,
    stelSeverity: severity,
    ceilingSeverity: severity,
    idlhSeverity: severity,
    noLimitNeededCas: z.array(z.string().trim().regex(/^\d{2,7}-\d{2}-\d$/, "A CAS number looks like 7732-18-5.")),
    source,
  }),
  spill: z.object({
    poolDepthM: z.number().positive("The pool depth must be above 0.").max(0.5, "The pool depth must be at most 0.5 m."),
    limitPoolToFloorArea: z.boolean(),
    airSpeedMPerS: z.number().positive("The air speed must be above 0.").max(20, "The air speed must be at most 20 m/s."),
    durationMin: z.number().positive("The duration must be above 0.").max(480, "The duration must be at most 480 min."),
    evaporationModel: z.enum(["epa-rmp", "mackay-matsugu"]),
    schmidtNumber: z.number().positive().max(10),
    source,
  }),
  quantities: z.object({
    warnFraction: z.number().gt(0, "The warning fraction must be above 0.").max(1, "The warning fraction must be at most 1 (100 %).").nullable(),
    warnSeverity: severity,
    exceededSeverity: severity,
    limits: z.array(quantityLimitSchema).max(200),
    source,
  }),
  oxygen: z
    .object({
      baselinePercent: z.number().gt(0).max(100),
      deficiencyPercent: z.number().gt(0).max(100),
      evacuatePercent: z.number().gt(0).max(100),
      deficiencySeverity: severity,
      evacuateSeverity: severity,
      expansionReferenceTempC: z.number().min(-50).max(60),
      source,
    })
    .refine((o) => o.evacuatePercent < o.deficiencyPercent && o.deficiencyPercent < o.baselinePercent, {
      message: "The thresholds must fall from normal air to deficient to evacuate.",
      path: ["deficiencyPercent"],
    }),
  carbonDioxide: z.object({
    limits: z
      .array(
        z.object({
          kind: z.enum(["TWA", "STEL", "ceiling", "IDLH"]),
          valuePpm: z.number().positive().max(1_000_000),
          body: z.string().trim().min(1).max(100),
          source,
        }),
      )
      .max(20),
    source,
  }),
  missingData: z.object({ severities: z.record(z.enum(MISSING_DATA_KINDS), severity), source }),
});

// ---------------------------------------------------------------------------------------------
// Severity
// ---------------------------------------------------------------------------------------------

const RANK: Record<Severity, number> = { low: 1, moderate: 2, high: 3, critical: 4 };

export function severityRank(severity: Severity): number {
  return RANK[severity];
}

/** The worse of two severities (null counts as none). */
export function worseSeverity(a: Severity | null, b: Severity | null): Severity | null {
  if (a === null) return b;
  if (b === null) return a;
  return RANK[a] >= RANK[b] ? a : b;
}

/** Fraction of the LFL → severity: critical, high, moderate at or above their fractions; below the moderate one, none. */
export function lflSeverity(fractionOfLfl: number, settings: AssessmentSettings): Severity | null {
  const { lfl } = settings;
  if (fractionOfLfl >= lfl.critical) return "critical";
  if (fractionOfLfl >= lfl.high) return "high";
  if (fractionOfLfl >= lfl.moderate) return "moderate";
  return null;
}

/** Ratio to a limit of one kind → severity: the kind's severity above 1; for the TWA the action severity at or above the action fraction. */
export function exposureSeverity(kind: ExposureLimitKind, ratio: number, settings: AssessmentSettings): Severity | null {
  const { exposure } = settings;
  if (ratio > 1) {
    switch (kind) {
      case "IDLH":
        return exposure.idlhSeverity;
      case "STEL":
        return exposure.stelSeverity;
      case "ceiling":
        return exposure.ceilingSeverity;
      default:
        return exposure.twaSeverity;
    }
  }
  if (kind === "TWA" && exposure.twaActionFraction !== null && ratio >= exposure.twaActionFraction) return exposure.actionSeverity;
  return null;
}

/** Total / limit → severity: exceeded above 1; a warning at or above the warning fraction. */
export function quantitySeverity(ratio: number, settings: AssessmentSettings): Severity | null {
  const { quantities } = settings;
  if (ratio > 1) return quantities.exceededSeverity;
  if (quantities.warnFraction !== null && ratio >= quantities.warnFraction) return quantities.warnSeverity;
  return null;
}

/** Oxygen % → severity: below the evacuation level, below the deficiency level; otherwise none. */
export function oxygenSeverity(oxygenPercent: number, settings: AssessmentSettings): Severity | null {
  const { oxygen } = settings;
  if (oxygenPercent < oxygen.evacuatePercent) return oxygen.evacuateSeverity;
  if (oxygenPercent < oxygen.deficiencyPercent) return oxygen.deficiencySeverity;
  return null;
}

/**
 * At or above the flash point; or within the margin below it (FP − T ≤ margin); otherwise none.
 * Inside a closed unit whose interior is free of ignition sources at most `ignitionFreeSeverity`.
 */
export function flashPointSeverity(tempC: number, flashPointC: number, settings: AssessmentSettings, ignitionFreeUnit = false): Severity | null {
  const marginToFlashPointC = flashPointC - tempC;
  let severity: Severity | null = null;
  if (marginToFlashPointC <= 0) severity = settings.flashPoint.atOrAboveSeverity;
  else if (marginToFlashPointC <= settings.flashPoint.marginC) severity = settings.flashPoint.withinMarginSeverity;
  if (severity !== null && ignitionFreeUnit && RANK[severity] > RANK[settings.flashPoint.ignitionFreeSeverity]) return settings.flashPoint.ignitionFreeSeverity;
  return severity;
}

/** Whether a liquid counts as flammable for storage: GHS category 1–3 or NFPA class I. */
export function isFlammableLiquid(ghsCategory: GhsFlammableCategory | null, nfpaClass: NfpaLiquidClass | null): boolean {
  return (ghsCategory !== null && ghsCategory <= 3) || nfpaClass === "IA" || nfpaClass === "IB" || nfpaClass === "IC";
}

/** Flammable liquid in an interior with ignition sources → severity by category (none for a liquid that is not flammable). */
export function ignitionSeverity(
  ghsCategory: GhsFlammableCategory | null,
  nfpaClass: NfpaLiquidClass | null,
  settings: AssessmentSettings,
): Severity | null {
  if ((ghsCategory !== null && ghsCategory <= 2) || nfpaClass === "IA" || nfpaClass === "IB") return settings.ignitionSource.category1And2Severity;
  if (isFlammableLiquid(ghsCategory, nfpaClass)) return settings.ignitionSource.category3Severity;
  return null;
}
