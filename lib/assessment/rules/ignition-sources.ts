/**
 * ignition-source-unit: a flammable liquid (GHS category 1–3 / NFPA class I) in a unit whose
 * interior has ignition sources, or in a walk-in cold room. A domestic refrigerator has
 * thermostats, light switches and heater strips in or exposed to its compartment (NFPA 45 (2004)
 * A.12.2.2.2.1); freezers and "other" units count as such unless marked free of ignition sources;
 * flammable-storage and explosion-proof refrigerators are rated not to; cabinets, shelving and
 * hoods have no electrical interior of their own. Cold rooms have fan motors and light switches
 * (university cold-room guidance) and are not designed for flammable storage.
 */
import type { StorageUnitKind } from "@/db/enums";
import { traceStep, traceValue } from "@/lib/hazard";
import { findingTrace, largestByMass, severityStep, UNIT_KIND_LABELS, type AssessmentContext, type ContentGroup } from "./context";
import { capitalise } from "./format";
import { ruleLabel } from "./rule-ids";
import { ignitionSeverity } from "./severity";
import type { UnitInfo } from "./types";

const BY_FLAG: ReadonlySet<StorageUnitKind> = new Set(["domestic_refrigerator", "freezer_minus_20", "freezer_minus_80", "other"]);

/** Why the interior has ignition sources, or null when it has none by rating, kind or flag. */
export function interiorIgnitionSources(unit: UnitInfo): string | null {
  if (!BY_FLAG.has(unit.kind) || unit.ignitionSourceFree) return null;
  return unit.kind === "domestic_refrigerator"
    ? "a domestic-type refrigerator not marked free of ignition sources: thermostats, light switches and heater strips sit in or next to the compartment (NFPA 45 (2004) annex A.12.2.2.2.1)"
    : `a ${UNIT_KIND_LABELS[unit.kind]} whose interior is not marked free of ignition sources`;
}

function classification(group: ContentGroup) {
  if (group.content.kind === "substance") {
    const s = group.content.substance;
    return { ghs: s.ghsCategory, nfpa: s.nfpaClass, flashPointC: s.flashPointC, basis: "from the flash point and normal boiling point" };
  }
  const m = group.content.mixture;
  return {
    ghs: m.ghsCategory,
    nfpa: m.nfpaClass,
    flashPointC: m.flashPointC,
    basis: m.flashPointBasis === "measured" ? "from the mixture's measured flash point" : "from the lowest component flash point and boiling point (screening)",
  };
}

function classText(ghs: number | null, nfpa: string | null): string {
  return [ghs !== null ? `GHS category ${ghs}` : null, nfpa !== null ? `NFPA class ${nfpa}` : null].filter(Boolean).join(", ");
}

export function ignitionSourceRule(ctx: AssessmentContext): void {
  let why: string | null = null;
  let where: string;
  if (ctx.unit) {
    why = interiorIgnitionSources(ctx.unit);
    where = `${ctx.unit.code}, whose interior has ignition sources`;
  } else {
    if (ctx.room.kind === "cold_room") {
      why = "a walk-in cold room: fan motors and light switches inside, recirculated air (university cold-room guidance; NRC Prudent Practices)";
    }
    where = `the cold room ${ctx.room.code}, which has ignition sources (fans, lights)`;
  }
  if (why === null) return;
  const { ignitionSource } = ctx.settings;
  for (const group of ctx.liquidGroups()) {
    const { ghs, nfpa, flashPointC, basis } = classification(group);
    const severity = ignitionSeverity(ghs, nfpa, ctx.settings);
    if (severity === null) continue;
    const classes = classText(ghs, nfpa);
    ctx.finding({
      rule: "ignition-source-unit",
      severity,
      scenario: ctx.primaryScenario,
      subject: group.subject,
      title: `${capitalise(group.name)} (${classes}) is stored in ${where}`,
      containerId: largestByMass(group).liquid.containerId,
      substanceId: group.substanceId,
      mixtureId: group.mixtureId,
      value: flashPointC,
      limitValue: 60,
      ratio: null,
      unit: "°C",
      view: null,
      containerIds: group.containers.map((c) => c.liquid.containerId),
      trace: () =>
        findingTrace({
          rule: "ignition-source-unit",
          scenario: ctx.primaryScenario,
          method: ruleLabel("ignition-source-unit"),
          source:
            "Flammable liquid: GHS / OSHA 29 CFR 1910.106(a)(19) category 1–3 (flash point ≤ 60 °C) or NFPA 30 class I; storage: NFPA 45 (2004) annex A.12.2.2.2.1, NRC Prudent Practices in the Laboratory",
          inputs: [
            traceValue("Location", "location", ctx.label, ""),
            traceValue("Ignition sources in the interior", "ignition", why, ""),
            traceValue("Flash point (closed cup)", "FP", flashPointC ?? "unknown", flashPointC === null ? "" : "°C"),
            traceValue("Classification", "class", classes, "", basis),
            traceValue("Flash point at or below which a liquid is flammable (GHS category 3 upper bound)", "FP_max", 60, "°C", "GHS ch. 2.6; OSHA 29 CFR 1910.106(a)(19)"),
          ],
          steps: [
            traceStep("Is it a flammable liquid?", "GHS category 1–3 or NFPA class IA/IB/IC", classes, traceValue("Flammable liquid", "flammable", true, "")),
            severityStep(
              "Severity by class",
              `category 1–2 / IA–IB → ${ignitionSource.category1And2Severity}; category 3 / IC → ${ignitionSource.category3Severity}`,
              `${classes} → ${severity}`,
              severity,
              ignitionSource.source,
            ),
          ],
          result: traceValue("Flammable liquid where ignition sources are", "finding", true, ""),
          parts: [],
          warnings: group.content.kind === "mixture" ? [...group.content.mixture.warnings] : [],
        }),
    });
  }
}
