/**
 * Why each default threshold is what it is: the reasoning and the source, shown on the thresholds
 * page. A source is a publication with its edition and clause, or "common practice" where no
 * published rule sets the value. Pure data built from the defaults, so the two cannot drift apart.
 */
import type { Severity } from "@/db/enums";
import { DEFAULT_ASSESSMENT_SETTINGS as D } from "./severity";

export type DefaultReason = {
  group: string;
  threshold: string;
  /** The default as people read it. */
  value: string;
  severity: Severity | null;
  reasoning: string;
  source: string;
};

const COMMON = "Common practice (no published rule sets this value).";
const pct = (fraction: number) => `${Math.round(fraction * 1000) / 10} %`;

export const DEFAULT_REASONS: readonly DefaultReason[] = [
  {
    group: "Flammable vapor",
    threshold: "Moderate from",
    value: `${pct(D.lfl.moderate)} of the LFL`,
    severity: "moderate",
    reasoning: "The point from which an atmosphere counts as hazardous: vapor is present well above trace levels, though far from burning.",
    source: "OSHA 29 CFR 1910.146(b), “hazardous atmosphere”: flammable gas, vapor or mist in excess of 10 percent of its lower flammable limit; NIOSH, IDLH value revisions (1994): 10 % of the LEL as an IDLH criterion.",
  },
  {
    group: "Flammable vapor",
    threshold: "High from",
    value: `${pct(D.lfl.high)} of the LFL`,
    severity: "high",
    reasoning: "A quarter of the LFL leaves a safety factor of four before the vapor can burn; codes stop operations there.",
    source: "NYC Fire Code 502.9.5: vapor detection in a vault's exhaust shuts dispensing down at 25 % of the LFL. The same 25 % is the usual ventilation design target and the limit below which an area is left unclassified: common practice.",
  },
  {
    group: "Flammable vapor",
    threshold: "Critical from",
    value: `${pct(D.lfl.critical)} of the LFL`,
    severity: "critical",
    reasoning: "At the LFL the vapor–air mixture can burn: an ignition source there starts a fire or an explosion.",
    source: "The lower flammable limit's own definition (IEC 60079-20-1; NFPA 497).",
  },
  {
    group: "Flammable vapor",
    threshold: "At most, inside a unit free of ignition sources",
    value: D.lfl.ignitionFreeMaxSeverity,
    severity: D.lfl.ignitionFreeMaxSeverity,
    reasoning:
      "A rated flammable-liquid cabinet, a flammable-storage or an explosion-proof refrigerator has nothing inside that can ignite the vapor; the vapor becomes a fire hazard once it escapes (door opened, spill). High keeps it on the list for action without treating the unit as a fire about to happen.",
    source: COMMON,
  },
  {
    group: "Flash point",
    threshold: "At or above the flash point",
    value: "worst case ≥ flash point",
    severity: D.flashPoint.atOrAboveSeverity,
    reasoning: "Above its closed-cup flash point a liquid gives off enough vapor to be ignited near its surface; where ignition sources are about (an open room, a domestic refrigerator), that needs attention.",
    source: "Flash point classes: UN GHS (category 1–4) and OSHA 29 CFR 1910.106(a)(19) (as revised in 2012). Grading it moderate: common practice.",
  },
  {
    group: "Flash point",
    threshold: "Margin below the flash point",
    value: `${D.flashPoint.marginC} °C`,
    severity: D.flashPoint.withinMarginSeverity,
    reasoning: "Flash points are measured under standard conditions; a flammable atmosphere can form a few degrees below them.",
    source:
      "ASTM E502: a flammable atmosphere might be present when a material is used at temperatures from 5 to 10 °C below its closed-cup flash point; OSHA 29 CFR 1910.106(a)(19)(v): a liquid heated to within 30 °F (16.7 °C) of its flash point is handled as the next more hazardous category.",
  },
  {
    group: "Flash point",
    threshold: "In a closed unit free of ignition sources",
    value: D.flashPoint.ignitionFreeSeverity,
    severity: D.flashPoint.ignitionFreeSeverity,
    reasoning:
      "Refrigerators and cabinets hold liquids above their flash points as a matter of course; what makes that dangerous is an ignition source inside, as in a domestic refrigerator. A flammable-storage or explosion-proof refrigerator and a closed flammable-liquid cabinet are built without one, so the flash-point line is information there. The vapor itself is still graded against the LFL by the closed-space rule.",
    source:
      "NFPA 45 (2004 edition), annex A.12.2.2.2.1: refrigerator temperatures are almost always above the flash points of the flammable liquids stored in them, and a domestic refrigerator has ignition sources (thermostats, light switches, heater strips) in or exposed to its compartment. Grading the flash-point line low in such a unit: common practice.",
  },
  {
    group: "Boiling point",
    threshold: "At or above the boiling point",
    value: "Psat ≥ site pressure",
    severity: D.boilingPoint.severity,
    reasoning: "The liquid boils: closed containers build pressure and can vent or burst, and open ones release vapor quickly.",
    source: "Boiling at Psat = Patm (any physical chemistry text). Grading it high: common practice.",
  },
  {
    group: "Ignition sources",
    threshold: "Category 1 and 2 liquid in an interior with ignition sources",
    value: D.ignitionSource.category1And2Severity,
    severity: D.ignitionSource.category1And2Severity,
    reasoning: "Very volatile flammable liquids (flash point below 23 °C) next to thermostats and switches: vapor reaches the ignition source at storage temperature.",
    source:
      "NFPA 45 (2004 edition), annex A.12.2.2.2.1; National Research Council, Prudent Practices in the Laboratory (1995 and 2011 editions): do not store flammable liquids in a refrigerator unless it is approved for such storage. The grade: common practice.",
  },
  {
    group: "Ignition sources",
    threshold: "Category 3 liquid in an interior with ignition sources",
    value: D.ignitionSource.category3Severity,
    severity: D.ignitionSource.category3Severity,
    reasoning: "Flash point from 23 to 60 °C: less vapor at storage temperature, but still a flammable liquid that should not share a space with ignition sources.",
    source: "As above; GHS / OSHA 29 CFR 1910.106(a)(19) category 3. The grade: common practice.",
  },
  {
    group: "Exposure",
    threshold: "Action level",
    value: `${pct(D.exposure.twaActionFraction ?? 0)} of the TWA`,
    severity: D.exposure.actionSeverity,
    reasoning: "Half the 8-hour limit is where monitoring and controls usually start.",
    source: "Common industrial-hygiene practice; for example OSHA 29 CFR 1910.1052 (methylene chloride): action level 12.5 ppm against a PEL of 25 ppm.",
  },
  {
    group: "Exposure",
    threshold: "Above the TWA / STEL / ceiling / IDLH",
    value: `${D.exposure.twaSeverity} / ${D.exposure.stelSeverity} / ${D.exposure.ceilingSeverity} / ${D.exposure.idlhSeverity}`,
    severity: null,
    reasoning: "The shorter and higher the limit that is crossed, the sooner harm follows: an 8-hour average, a 15-minute peak, an instant ceiling, and a level that threatens life or escape.",
    source: "Limit kinds as OSHA 29 CFR 1910.1000 (TWA, ceiling) and NIOSH (REL TWA, 15-minute STEL, IDLH; Criteria for determining IDLH values) define them. The grades: common practice.",
  },
  {
    group: "Spill",
    threshold: "Pool depth",
    value: `${D.spill.poolDepthM * 100} cm`,
    severity: null,
    reasoning: "An undiked spill spreads thin: its area, and so its evaporation, follows from its volume and depth.",
    source: "US EPA, Risk Management Program Guidance for Offsite Consequence Analysis (EPA 550-B-99-009, 1999): 1 cm for an undiked spill; DOE-STD-3014-96.",
  },
  {
    group: "Spill",
    threshold: "Air speed over the pool",
    value: `${D.spill.airSpeedMPerS} m/s`,
    severity: null,
    reasoning: "Evaporation grows with the air speed over the pool; indoor air moves slowly.",
    source: "National Research Council, Prudent Practices for Handling Hazardous Chemicals in Laboratories (1981), §I.H.1: laboratory air typically moves at about 20 ft/min (0.10 m/s).",
  },
  {
    group: "Spill",
    threshold: "Duration",
    value: `${D.spill.durationMin} min`,
    severity: null,
    reasoning: "The time over which the concentration after a spill is averaged, to compare it with a 15-minute limit.",
    source: "The STEL averaging period (NIOSH; OSHA 29 CFR 1910.1000).",
  },
  {
    group: "Spill",
    threshold: "Schmidt number (Mackay–Matsugu only)",
    value: String(D.spill.schmidtNumber),
    severity: null,
    reasoning: "Sc = ν/D: the kinematic viscosity of air (about 1.5 × 10⁻⁵ m²/s at 20 °C) over the diffusivity of a solvent vapor in air (about 10⁻⁵ m²/s).",
    source: COMMON,
  },
  {
    group: "Quantities",
    threshold: "Early warning",
    value: `${pct(D.quantities.warnFraction ?? 0)} of a limit`,
    severity: D.quantities.warnSeverity,
    reasoning: "Room to act before a delivery takes a cabinet or room over its limit.",
    source: COMMON,
  },
  {
    group: "Quantities",
    threshold: "Over a limit",
    value: "total > limit",
    severity: D.quantities.exceededSeverity,
    reasoning: "A quantity over the adopted code's limit breaks the code; the example limits stand until your organisation enters its own.",
    source:
      "Example limits: NFPA 30 (2008) §9.5 and OSHA 29 CFR 1910.106(d)(3)(i) for cabinets; IFC (2012) Table 5003.1.1(1) for control areas. The authority having jurisdiction decides which edition applies.",
  },
  {
    group: "Oxygen",
    threshold: "Deficient below",
    value: `${D.oxygen.deficiencyPercent} % O₂`,
    severity: D.oxygen.deficiencySeverity,
    reasoning: "Below it the air is oxygen-deficient by law; people may not work there without protection.",
    source: "OSHA 29 CFR 1910.134(d)(2)(iii) and 1910.146(b).",
  },
  {
    group: "Oxygen",
    threshold: "Evacuate below",
    value: `${D.oxygen.evacuatePercent} % O₂`,
    severity: D.oxygen.evacuateSeverity,
    reasoning: "The second alarm of oxygen monitors: leave the room.",
    source: "Oxygen-depletion guidance SOM036a: many oxygen-depletion sensors warn first at 19.5 % and call for evacuation at 18 %.",
  },
  {
    group: "Carbon dioxide",
    threshold: "TWA / STEL / IDLH",
    value: "5,000 / 30,000 / 40,000 ppm",
    severity: null,
    reasoning: "Dry ice releases CO₂, a toxic gas at these levels and not only an asphyxiant.",
    source: "NIOSH IDLH documentation for carbon dioxide (May 1994): REL TWA 5,000 ppm, STEL 30,000 ppm, IDLH 40,000 ppm.",
  },
  {
    group: "Missing data",
    threshold: "A gap that stops an assessment / one a conservative estimate covers",
    value: "moderate / low",
    severity: null,
    reasoning: "A location that cannot be assessed is not known to be safe; where the saturation bound or an estimate stands in, the result is already on the safe side.",
    source: COMMON,
  },
];
