/**
 * flash-point: the worst-case temperature at or above a liquid's closed-cup flash point (flammable
 * vapor forms over it), or within the configured margin below it (ASTM E502: 5–10 °C).
 * boiling-point: the worst case at or above the boiling point at the site's pressure — the liquid
 * boils and a closed container can pressurise (Psat ≥ Patm; for a mixture Σ xᵢ·Pᵢsat ≥ Patm).
 */
import {
  raoultMixture,
  saturationPressure,
  traceSaturatedConcentration,
  traceStep,
  traceValue,
  type Trace,
  type TraceValue,
} from "@/lib/hazard";
import { cachedBoilingTempC, cachedLowerFlammableTempC } from "./cache";
import { findingTrace, isClosedUnit, largestByMass, severityStep, worstCaseInput, type AssessmentContext, type ContentGroup, type ScenarioView } from "./context";
import { capitalise, formatQuantity, formatSig, formatTempC } from "./format";
import { ruleLabel } from "./rule-ids";
import { flashPointSeverity } from "./severity";
import { groupVapor } from "./vapors";

function flashPointOf(group: ContentGroup): { flashPointC: number | null; source: string } {
  if (group.content.kind === "substance") {
    const substance = group.content.substance;
    return { flashPointC: substance.flashPointC, source: substance.sources.flashPointC ?? "substance data" };
  }
  const mixture = group.content.mixture;
  return {
    flashPointC: mixture.flashPointC,
    source: mixture.flashPointBasis === "measured" ? "measured or SDS flash point of the mixture" : "lowest component flash point (screening value)",
  };
}

function flashPointFinding(ctx: AssessmentContext, group: ContentGroup, view: ScenarioView): void {
  const { flashPointC, source } = flashPointOf(group);
  if (flashPointC === null) {
    const substance = group.content.kind === "substance" ? group.content.substance : null;
    if (substance && substance.lflVolPercent !== null) {
      ctx.missing({
        kind: "no-flash-point",
        subject: group.subject,
        subjectName: group.name,
        scenario: view.scenario,
        what: "an LFL but no flash point",
        consequence: "it cannot be classed (GHS category, NFPA class): the flash-point, ignition-source and quantity rules leave it out",
        substanceId: group.substanceId,
        containerIds: group.containers.map((c) => c.liquid.containerId),
      });
    }
    return;
  }
  // A closed unit whose interior is free of ignition sources is built to hold liquids above their
  // flash points: the vapor inside has nothing to ignite it (the enclosure rule grades the vapor).
  const ignitionFreeUnit = ctx.unit !== null && ctx.unit.ignitionSourceFree && isClosedUnit(ctx.unit);
  const severity = flashPointSeverity(view.tempC, flashPointC, ctx.settings, ignitionFreeUnit);
  if (severity === null) return;
  const { flashPoint } = ctx.settings;
  const gradeWithoutUnit = flashPointSeverity(view.tempC, flashPointC, ctx.settings);
  const marginToFlashPointC = flashPointC - view.tempC;
  const atOrAbove = marginToFlashPointC <= 0;
  ctx.finding({
    rule: "flash-point",
    severity,
    scenario: view.scenario,
    subject: group.subject,
    title: atOrAbove
      ? `${capitalise(group.name)} in ${ctx.label} is above its flash point of ${formatTempC(flashPointC)} ${view.phrase}`
      : `${capitalise(group.name)} in ${ctx.label} comes within ${formatQuantity(marginToFlashPointC, "°C", 2)} of its flash point of ${formatTempC(flashPointC)} ${view.phrase}`,
    containerId: largestByMass(group).liquid.containerId,
    substanceId: group.substanceId,
    mixtureId: group.mixtureId,
    value: view.tempC,
    limitValue: flashPointC,
    ratio: null,
    unit: "°C",
    view,
    containerIds: group.containers.map((c) => c.liquid.containerId),
    trace: () => {
      const inputs: TraceValue[] = [
        worstCaseInput(view),
        traceValue("Flash point (closed cup)", "FP", flashPointC, "°C", source),
        traceValue("Margin below the flash point that is flagged", "ΔT_margin", flashPoint.marginC, "°C", "settings: flash-point margin (its source is on the severity step)"),
      ];
      const warnings: string[] = [];
      if (group.content.kind === "substance" && group.content.substance.lflVolPercent !== null) {
        const lower = cachedLowerFlammableTempC(ctx.cache, group.content.substance, ctx.pressureKPa);
        if (lower.ok && lower.tempC !== null) {
          inputs.push(
            traceValue("Lower flammable temperature (Psat/Patm = LFL, equilibrium)", "T_L", lower.tempC, "°C", "lower temperature limit of flammability as in ASTM E1232, from the vapor-pressure data and the LFL"),
          );
        }
      } else if (group.content.kind === "mixture") {
        warnings.push(...group.content.mixture.warnings);
      }
      warnings.push("The flash point is measured at 101.3 kPa; at a lower site pressure the liquid flashes at a lower temperature");
      const steps = [
        traceStep(
          "Margin from the worst-case temperature to the flash point",
          "ΔT = FP − T",
          `ΔT = ${formatSig(flashPointC, 4)} − ${formatSig(view.tempC, 4)} = ${formatSig(marginToFlashPointC, 4)} °C`,
          traceValue("Margin to the flash point", "ΔT", marginToFlashPointC, "°C"),
        ),
        severityStep(
          "Severity: at or above the flash point, or within the margin below it",
          `ΔT ≤ 0 → ${flashPoint.atOrAboveSeverity}; 0 < ΔT ≤ ${flashPoint.marginC} °C → ${flashPoint.withinMarginSeverity}`,
          `ΔT = ${formatSig(marginToFlashPointC, 4)} °C → ${gradeWithoutUnit}`,
          gradeWithoutUnit ?? severity,
          flashPoint.source,
        ),
      ];
      if (gradeWithoutUnit !== severity) {
        steps.push(
          severityStep(
            `${ctx.unit?.code ?? "The unit"} is closed and its interior is free of ignition sources: information only`,
            "severity = min(severity from ΔT, severity for an ignition-free closed unit)",
            `min(${gradeWithoutUnit}, ${flashPoint.ignitionFreeSeverity}) = ${severity}`,
            severity,
            flashPoint.source,
          ),
        );
      }
      return findingTrace({
        rule: "flash-point",
        scenario: view.scenario,
        method: ruleLabel("flash-point"),
        source: "Closed-cup flash point (NIST glossary: corrected to 101.3 kPa); margin after ASTM E502 and OSHA 29 CFR 1910.106(a)(19)",
        inputs,
        steps,
        result: traceValue("Margin to the flash point", "ΔT", marginToFlashPointC, "°C"),
        parts: [],
        warnings,
      });
    },
  });
}

/** Bubble temperature of an ideal mixture at the site pressure: Σ xᵢ·Pᵢsat(T) = Patm, by bisection. */
function bubbleTemperatureC(ctx: AssessmentContext, group: ContentGroup, hotTempC: number): number | null {
  if (group.content.kind !== "mixture") return null;
  const components = group.content.mixture.components;
  const total = (tempC: number): number => {
    let sum = 0;
    for (const c of components) sum += c.moleFraction * saturationPressure(c.substance.props, tempC).pressureKPa;
    return sum;
  };
  try {
    let highC = hotTempC;
    let lowC = hotTempC - 25;
    for (let i = 0; i < 20 && total(lowC) >= ctx.pressureKPa; i++) lowC -= 25;
    for (let i = 0; i < 60 && highC - lowC > 1e-6; i++) {
      const midC = 0.5 * (lowC + highC);
      if (total(midC) < ctx.pressureKPa) lowC = midC;
      else highC = midC;
    }
    return 0.5 * (lowC + highC);
  } catch {
    return null;
  }
}

function boilingPointFinding(ctx: AssessmentContext, group: ContentGroup, view: ScenarioView): void {
  const vapor = groupVapor(ctx, group, view.tempC, view.scenario);
  if (vapor === null || !vapor.boils) return;
  const parts: Trace[] = [];
  let boilingTempC: number | null = null;
  let basis: string;
  if (group.content.kind === "substance") {
    const substance = group.content.substance;
    const boiling = cachedBoilingTempC(ctx.cache, substance, ctx.pressureKPa);
    boilingTempC = boiling.ok ? boiling.tempC : substance.normalBoilingPointC;
    basis = "temperature at which the vapor-pressure correlation reaches the site's pressure";
    parts.push(
      traceSaturatedConcentration({
        props: substance.props,
        tempC: view.tempC,
        ambientPressureKPa: ctx.pressureKPa,
        substanceName: substance.name,
        propertySources: substance.sources,
        tempSource: view.source,
      }).trace,
    );
  } else {
    boilingTempC = bubbleTemperatureC(ctx, group, view.tempC);
    basis = "bubble temperature of the ideal mixture at the site's pressure, Σ xᵢ·Pᵢsat(T) = Patm";
    if (vapor.leftOut.length === 0) {
      parts.push(
        raoultMixture({
          components: vapor.components.map((c) => ({ name: c.substance.name, moleFraction: c.moleFraction, props: c.substance.props })),
          tempC: view.tempC,
          ambientPressureKPa: ctx.pressureKPa,
        }).trace,
      );
    }
  }
  const { boilingPoint } = ctx.settings;
  const severity = boilingPoint.severity;
  const inputs: TraceValue[] = [
    worstCaseInput(view),
    traceValue("Ambient pressure", "Patm", ctx.pressureKPa, "kPa", "the site's atmospheric pressure"),
    ...(boilingTempC !== null ? [traceValue("Boiling temperature at Patm", "Tb", boilingTempC, "°C", basis)] : []),
  ];
  const steps = [
    traceStep(
      "Vapor pressure against the ambient pressure",
      "boils when P(T) ≥ Patm",
      `P = ${formatSig(vapor.totalPressureKPa, 5)} kPa ≥ ${formatSig(ctx.pressureKPa, 5)} kPa`,
      traceValue("Vapor pressure at T", "P", vapor.totalPressureKPa, "kPa"),
    ),
    severityStep("Severity: the liquid boils at the worst case", `P ≥ Patm → ${severity}`, `→ ${severity}`, severity, boilingPoint.source),
  ];
  const boilingText = boilingTempC !== null ? ` (boiling point ${formatTempC(boilingTempC)} at ${formatSig(ctx.pressureKPa, 4)} kPa)` : "";
  ctx.finding({
    rule: "boiling-point",
    severity,
    scenario: view.scenario,
    subject: group.subject,
    title: `${capitalise(group.name)} in ${ctx.label} would boil ${view.phrase}${boilingText}: closed containers can pressurise`,
    containerId: largestByMass(group).liquid.containerId,
    substanceId: group.substanceId,
    mixtureId: group.mixtureId,
    value: view.tempC,
    limitValue: boilingTempC,
    ratio: null,
    unit: "°C",
    view,
    containerIds: group.containers.map((c) => c.liquid.containerId),
    trace: () =>
      findingTrace({
        rule: "boiling-point",
        scenario: view.scenario,
        method: ruleLabel("boiling-point"),
        source: "A liquid boils where its vapor pressure reaches the ambient pressure (Dalton's law; Raoult's law for a mixture)",
        inputs,
        steps,
        result: traceValue("Vapor pressure at T", "P", vapor.totalPressureKPa, "kPa"),
        parts,
        warnings: vapor.leftOut.map((name) => `${name} is left out: its vapor pressure cannot be computed`),
      }),
  });
}

export function flashPointAndBoilingRules(ctx: AssessmentContext, view: ScenarioView): void {
  for (const group of ctx.liquidGroups()) {
    flashPointFinding(ctx, group, view);
    boilingPointFinding(ctx, group, view);
  }
}
