/**
 * enclosure-lfl: in a closed unit or an unventilated room the vapor cannot exceed the saturation
 * concentration, nor what the releasable liquid gives when it all evaporates into the free volume,
 * C = min(C_sat, m·Vm/(M·V_free)) (closed-room worst case after Popendorf). Two releases: the
 * largest container of each substance or mixture, and all open containers together. The result
 * is a fraction of the LFL, Σ Cᵢ/LFLᵢ (Le Chatelier's rule in its additive form).
 */
import {
  enclosureBound,
  leChatelierMixture,
  lflFraction,
  molarVolumeLPerMol,
  raoultMixture,
  traceSaturatedConcentration,
  traceStep,
  traceValue,
  type Trace,
  type TraceStep,
  type TraceValue,
} from "@/lib/hazard";
import type { Severity } from "@/db/enums";
import {
  findingTrace,
  largestByMass,
  severityStep,
  worstCaseInput,
  type AssessmentContext,
  type ContentGroup,
  type MeasuredContainer,
  type ScenarioView,
} from "./context";
import { capitalise, formatSig, formatSignificant } from "./format";
import { ruleLabel } from "./rule-ids";
import { lflSeverity, severityRank } from "./severity";
import type { FindingTrace, SubstanceSnapshot } from "./types";
import { groupVapor, lflOf, type ComponentVapor, type GroupVapor } from "./vapors";

export type EnclosureVolume = {
  /** Null when the enclosure's volume is unknown: the saturation concentration alone bounds the vapor. */
  readonly freeVolumeM3: number | null;
  /** How the free volume was found, for the trace. */
  readonly inputs: TraceValue[];
  readonly warnings: string[];
};

const BOUND_SOURCE =
  "C = min(C_sat, m·Vm/(M·V_free)) (closed-room worst case after Popendorf, Taylor & Francis, ISBN 9781351238052); fraction of the LFL Σ Cᵢ/LFLᵢ (Le Chatelier's rule, additive form)";

/** C_inv = (m/M)·Vm/(1000·V_free) × 10⁶ ppm, at most 10⁶ (the same form as the engine's enclosure bound). */
function inventoryPpm(massG: number, molarMassGPerMol: number, molarVolumeL: number, freeVolumeM3: number): number {
  return Math.min(1e6, (((massG / molarMassGPerMol) * molarVolumeL) / (1000 * freeVolumeM3)) * 1e6);
}

function lflThresholdsText(ctx: AssessmentContext): string {
  const { lfl } = ctx.settings;
  return `f ≥ ${formatSig(lfl.critical, 3)} → critical; f ≥ ${formatSig(lfl.high, 3)} → high; f ≥ ${formatSig(lfl.moderate, 3)} → moderate`;
}

export function lflSeverityStep(ctx: AssessmentContext, fraction: number, severity: NonNullable<ReturnType<typeof lflSeverity>>): TraceStep {
  const { lfl } = ctx.settings;
  const threshold = severity === "critical" ? lfl.critical : severity === "high" ? lfl.high : lfl.moderate;
  return severityStep(
    "Severity from the LFL alarm fractions (reached at or above)",
    lflThresholdsText(ctx),
    `f = ${formatSig(fraction, 4)} ≥ ${formatSig(threshold, 3)} → ${severity}`,
    severity,
    ctx.settings.lfl.source,
  );
}

type EnclosureGrade = { severity: Severity; fromFraction: Severity; capped: boolean };

/**
 * An enclosure finding's severity: from the LFL alarm fractions, and inside a unit whose interior
 * is free of ignition sources at most the settings' `lfl.ignitionFreeMaxSeverity`.
 */
export function enclosureSeverity(ctx: AssessmentContext, fraction: number): EnclosureGrade | null {
  const fromFraction = lflSeverity(fraction, ctx.settings);
  if (fromFraction === null) return null;
  const cap = ctx.settings.lfl.ignitionFreeMaxSeverity;
  if (ctx.unit?.ignitionSourceFree && severityRank(fromFraction) > severityRank(cap)) return { severity: cap, fromFraction, capped: true };
  return { severity: fromFraction, fromFraction, capped: false };
}

function enclosureSeveritySteps(ctx: AssessmentContext, fraction: number, grade: EnclosureGrade): TraceStep[] {
  const steps = [lflSeverityStep(ctx, fraction, grade.fromFraction)];
  if (grade.capped) {
    steps.push(
      severityStep(
        "The unit's interior is free of ignition sources: at most the severity the settings allow for such a unit",
        "severity = min(severity from f, cap for an ignition-free interior)",
        `min(${grade.fromFraction}, ${grade.severity}) = ${grade.severity}`,
        grade.severity,
        ctx.settings.lfl.source,
      ),
    );
  }
  return steps;
}

export function lflThresholdInputs(ctx: AssessmentContext): TraceValue[] {
  const { lfl } = ctx.settings;
  const from = "settings: LFL alarm fractions (their source is on the severity step)";
  return [
    traceValue("LFL fraction for a moderate finding", "f_moderate", lfl.moderate, "", from),
    traceValue("LFL fraction for a high finding", "f_high", lfl.high, "", from),
    traceValue("LFL fraction for a critical finding", "f_critical", lfl.critical, "", from),
  ];
}

export function lflTemperatureWarnings(tempC: number): string[] {
  return tempC > 25
    ? [
        `LFLs are tabulated near 25 °C and fall as the temperature rises (Burgess–Wheeler; Zabetakis); at ${formatSig(tempC, 3)} °C the fraction of the LFL shown is somewhat low`,
      ]
    : [];
}

type Contribution = { component: ComponentVapor; lflVolPercent: number; massG: number | null; inventoryPpm: number; concentrationPpm: number };

/** The vapors of one release from one group: each combustible component at min(C_sat, C_inv). */
function contributions(vapor: GroupVapor, lfls: (number | null)[], massG: number | null, molarVolumeL: number, freeVolumeM3: number | null): Contribution[] {
  const list: Contribution[] = [];
  vapor.components.forEach((component, i) => {
    const lflVolPercent = lfls[i];
    if (lflVolPercent === null) return;
    const componentMassG = massG === null ? null : massG * component.massFraction;
    const inv =
      componentMassG === null || freeVolumeM3 === null ? Number.POSITIVE_INFINITY : inventoryPpm(componentMassG, component.substance.molarMassGPerMol, molarVolumeL, freeVolumeM3);
    list.push({ component, lflVolPercent, massG: componentMassG, inventoryPpm: inv, concentrationPpm: Math.min(component.concentrationPpm, inv) });
  });
  return list;
}

function fractionOf(list: readonly { concentrationPpm: number; lflVolPercent: number }[]): number {
  let fraction = 0;
  for (const item of list) fraction += item.concentrationPpm / (item.lflVolPercent * 10_000);
  return fraction;
}

function inventorySteps(list: Contribution[], molarVolumeL: number, freeVolumeM3: number | null): TraceStep[] {
  return list.map((item) => {
    const name = item.component.substance.name;
    if (item.massG === null || freeVolumeM3 === null) {
      return traceStep(
        `${capitalise(name)}: no inventory bound (${freeVolumeM3 === null ? "volume unknown" : "mass unknown"}), the saturated concentration bounds the vapor`,
        "C = C_sat",
        `C = ${formatSig(item.component.concentrationPpm, 5)} ppm`,
        traceValue(`Concentration of ${name}`, "C", item.concentrationPpm, "ppm"),
      );
    }
    return traceStep(
      `${capitalise(name)}: the smaller of the saturated and the all-evaporated concentration`,
      "C = min(C_sat, (m/M)·Vm/(1000·V_free) × 10⁶)",
      `C = min(${formatSig(item.component.concentrationPpm, 5)}, (${formatSig(item.massG, 5)}/${item.component.substance.molarMassGPerMol}) × ${formatSig(molarVolumeL, 5)} / (1000 × ${formatSig(freeVolumeM3, 4)}) × 10⁶ = ${formatSig(item.inventoryPpm, 5)}) = ${formatSig(item.concentrationPpm, 5)} ppm`,
      traceValue(`Concentration of ${name}`, "C", item.concentrationPpm, "ppm"),
    );
  });
}

function lflPart(list: readonly Contribution[], alarmFractions: number[]): Trace {
  return lflFraction({
    components: list.map((item) => ({ name: item.component.substance.name, concentrationPpm: item.concentrationPpm, lflVolPercent: item.lflVolPercent })),
    alarmFractions,
  }).trace;
}

/** Raoult's law trace for a mixture; null when a component was left out (the fractions no longer sum to 1). */
function raoultPart(ctx: AssessmentContext, vapor: GroupVapor, tempC: number): Trace | null {
  if (vapor.leftOut.length > 0) return null;
  return raoultMixture({
    components: vapor.components.map((c) => ({ name: c.substance.name, moleFraction: c.moleFraction, props: c.substance.props })),
    tempC,
    ambientPressureKPa: ctx.pressureKPa,
  }).trace;
}

function leChatelierPart(list: readonly Contribution[]): Trace | null {
  const total = list.reduce((sum, item) => sum + item.concentrationPpm, 0);
  if (list.length < 2 || !(total > 0)) return null;
  return leChatelierMixture(
    list.map((item) => ({ name: item.component.substance.name, moleFraction: item.concentrationPpm / total, lflVolPercent: item.lflVolPercent })),
  ).trace;
}

/** A substance's vapor pressure (the correlation with its coefficients, range and source) and saturated concentration at the worst case. */
export function saturationPart(ctx: AssessmentContext, substance: SubstanceSnapshot, view: ScenarioView): Trace {
  return traceSaturatedConcentration({
    props: substance.props,
    tempC: view.tempC,
    ambientPressureKPa: ctx.pressureKPa,
    substanceName: substance.name,
    propertySources: substance.sources,
    tempSource: view.source,
  }).trace;
}

function largestContainerFinding(
  ctx: AssessmentContext,
  group: ContentGroup,
  vapor: GroupVapor,
  lfls: (number | null)[],
  view: ScenarioView,
  volume: EnclosureVolume,
  molarVolumeL: number,
): void {
  const largest = largestByMass(group);
  const list = contributions(vapor, lfls, largest.massG, molarVolumeL, volume.freeVolumeM3);
  if (list.length === 0) return;
  const fraction = fractionOf(list);
  const grade = enclosureSeverity(ctx, fraction);
  if (grade === null) return;
  const severity = grade.severity;
  const percent = fraction * 100;
  ctx.finding({
    rule: "enclosure-lfl",
    severity,
    scenario: view.scenario,
    subject: group.subject,
    title: `${capitalise(group.name)} in ${ctx.label} could reach ${formatSignificant(percent)} % LFL ${view.phrase}`,
    containerId: largest.liquid.containerId,
    substanceId: group.substanceId,
    mixtureId: group.mixtureId,
    value: percent,
    limitValue: 100,
    ratio: fraction,
    unit: "% LFL",
    view,
    containerIds: group.containers.map((c) => c.liquid.containerId),
    trace: () => largestContainerTrace(ctx, group, vapor, list, largest, view, volume, molarVolumeL, fraction, grade),
  });
}

function largestContainerTrace(
  ctx: AssessmentContext,
  group: ContentGroup,
  vapor: GroupVapor,
  list: Contribution[],
  largest: MeasuredContainer,
  view: ScenarioView,
  volume: EnclosureVolume,
  molarVolumeL: number,
  fraction: number,
  grade: EnclosureGrade,
): FindingTrace {
  const { lfl } = ctx.settings;
  const parts: Trace[] = [];
  const steps: TraceStep[] = [];
  if (group.content.kind === "substance") {
    const substance = group.content.substance;
    if (volume.freeVolumeM3 !== null && largest.massG !== null) {
      parts.push(
        enclosureBound({
          props: substance.props,
          substanceName: substance.name,
          propertySources: substance.sources,
          tempC: view.tempC,
          tempSource: view.source,
          freeVolumeM3: volume.freeVolumeM3,
          containers: group.containers.filter((c) => c.massG !== null).map((c) => ({ label: c.liquid.label, massG: c.massG as number, open: c.open })),
          scenario: "largest-container",
          ambientPressureKPa: ctx.pressureKPa,
        }).trace,
      );
    } else {
      parts.push(saturationPart(ctx, substance, view));
      steps.push(...inventorySteps(list, molarVolumeL, volume.freeVolumeM3));
    }
  } else {
    // Each component's own vapor pressure first, so Raoult's law can be followed from its Pᵢsat.
    for (const component of vapor.components) parts.push(saturationPart(ctx, component.substance, view));
    const raoult = raoultPart(ctx, vapor, view.tempC);
    if (raoult) parts.push(raoult);
    steps.push(...mixtureSteps(vapor));
    steps.push(...inventorySteps(list, molarVolumeL, volume.freeVolumeM3));
  }
  parts.push(lflPart(list, [lfl.moderate, lfl.high, lfl.critical]));
  const chatelier = leChatelierPart(list);
  if (chatelier) parts.push(chatelier);
  steps.push(...enclosureSeveritySteps(ctx, fraction, grade));
  const percent = fraction * 100;
  return findingTrace({
    rule: "enclosure-lfl",
    scenario: view.scenario,
    method: `${ruleLabel("enclosure-lfl")}: the largest container of ${group.name}`,
    source: BOUND_SOURCE,
    inputs: [
      worstCaseInput(view),
      traceValue("Ambient pressure", "Patm", ctx.pressureKPa, "kPa", "the site's atmospheric pressure"),
      ...volume.inputs,
      traceValue(
        `Releasable liquid: the largest container of ${group.name} (${largest.liquid.label})`,
        "m",
        largest.massG ?? "unknown",
        largest.massG === null ? "" : "g",
        largest.volumeL !== null ? `${formatSig(largest.volumeL, 4)} L` : undefined,
      ),
      ...lflThresholdInputs(ctx),
    ],
    steps,
    result: traceValue("Fraction of the LFL", "f", percent, "% LFL"),
    parts,
    warnings: [
      ...volume.warnings,
      ...lflTemperatureWarnings(view.tempC),
      ...(group.content.kind === "mixture" ? group.content.mixture.warnings : []),
      ...vapor.leftOut.map((name) => `${name} is left out: its vapor pressure cannot be computed`),
    ],
  });
}

function mixtureSteps(vapor: GroupVapor): TraceStep[] {
  if (vapor.leftOut.length === 0) return [];
  // Without the engine's Raoult trace (a component was left out), the partial pressures by hand.
  return vapor.components.map((c) =>
    traceStep(
      `Partial pressure of ${c.substance.name} (Raoult's law)`,
      "pᵢ = xᵢ·Pᵢsat(T); Cᵢ = pᵢ/Patm × 10⁶",
      `p = ${formatSig(c.moleFraction, 4)} × ${formatSig(c.saturation.pressureKPa, 5)} kPa = ${formatSig(c.partialPressureKPa, 5)} kPa; C = ${formatSig(c.concentrationPpm, 5)} ppm`,
      traceValue(`Concentration of ${c.substance.name} over the liquid`, "C_sat", c.concentrationPpm, "ppm"),
    ),
  );
}

/** The whole volume, in ppm. */
const PPM_WHOLE = 1_000_000;

type OpenTotal = {
  substance: SubstanceSnapshot;
  lflVolPercent: number;
  pureSaturatedPpm: number;
  sumPpm: number;
  /** Each open group's share, for the trace. */
  shares: { groupName: string; saturatedPpm: number; inventoryPpm: number; concentrationPpm: number }[];
};

function shareText(total: OpenTotal): string {
  return total.shares
    .map(
      (share) =>
        `${share.groupName}: min(${formatSig(share.saturatedPpm, 5)}, ${Number.isFinite(share.inventoryPpm) ? formatSig(share.inventoryPpm, 5) : "no inventory bound"}) = ${formatSig(share.concentrationPpm, 5)} ppm`,
    )
    .join("; ");
}

/** Runs the rule for one scenario over every liquid in the enclosure. */
export function enclosureRule(ctx: AssessmentContext, view: ScenarioView, volume: EnclosureVolume): void {
  const molarVolumeL = molarVolumeLPerMol(view.tempC, ctx.pressureKPa);
  const openTotals = new Map<number, OpenTotal>();
  const openContainerIds: number[] = [];
  for (const group of ctx.liquidGroups()) {
    const vapor = groupVapor(ctx, group, view.tempC, view.scenario);
    if (vapor === null) continue;
    const lfls = vapor.components.map((c) => lflOf(ctx, c.substance, group, view.scenario));
    if (lfls.every((value) => value === null)) continue;
    largestContainerFinding(ctx, group, vapor, lfls, view, volume, molarVolumeL);

    const open = group.containers.filter((c) => c.open);
    if (open.length === 0) continue;
    for (const c of open) openContainerIds.push(c.liquid.containerId);
    const openMassG = open.some((c) => c.massG === null) ? null : open.reduce((sum, c) => sum + (c.massG as number), 0);
    for (const item of contributions(vapor, lfls, openMassG, molarVolumeL, volume.freeVolumeM3)) {
      const substance = item.component.substance;
      let total = openTotals.get(substance.id);
      if (total === undefined) {
        total = { substance, lflVolPercent: item.lflVolPercent, pureSaturatedPpm: item.component.saturation.ppm, sumPpm: 0, shares: [] };
        openTotals.set(substance.id, total);
      }
      total.sumPpm += item.concentrationPpm;
      total.shares.push({ groupName: group.name, saturatedPpm: item.component.concentrationPpm, inventoryPpm: item.inventoryPpm, concentrationPpm: item.concentrationPpm });
    }
  }
  if (openContainerIds.length < 2 || openTotals.size === 0) return;
  openContainersFinding(ctx, view, volume, [...openTotals.values()], openContainerIds, molarVolumeL);
}

function openContainersFinding(
  ctx: AssessmentContext,
  view: ScenarioView,
  volume: EnclosureVolume,
  totals: OpenTotal[],
  openContainerIds: number[],
  molarVolumeL: number,
): void {
  const own = totals.map((total) => ({ total, ownPpm: Math.min(total.sumPpm, total.pureSaturatedPpm), lflVolPercent: total.lflVolPercent }));
  // Each liquid evaporates to its own saturation (Dalton's law); if the partial pressures together
  // exceed the ambient pressure, the enclosure (not pressure-tight) holds vapor only, shared in
  // proportion to them: the concentrations cannot add up to more than 10⁶ ppm.
  const sumPpm = own.reduce((sum, item) => sum + item.ownPpm, 0);
  const scale = sumPpm > PPM_WHOLE ? PPM_WHOLE / sumPpm : 1;
  const items = own.map((item) => ({ ...item, concentrationPpm: item.ownPpm * scale }));
  const fraction = fractionOf(items);
  const grade = enclosureSeverity(ctx, fraction);
  if (grade === null) return;
  const severity = grade.severity;
  const percent = fraction * 100;
  ctx.finding({
    rule: "enclosure-lfl",
    severity,
    scenario: view.scenario,
    subject: { kind: "location", key: "open-containers" },
    title: `Open containers in ${ctx.label} could reach ${formatSignificant(percent)} % LFL together ${view.phrase}`,
    substanceId: totals.length === 1 ? totals[0].substance.id : null,
    value: percent,
    limitValue: 100,
    ratio: fraction,
    unit: "% LFL",
    view,
    containerIds: openContainerIds,
    trace: () => {
      const { lfl } = ctx.settings;
      const lflTrace = lflFraction({
        components: items.map((item) => ({ name: item.total.substance.name, concentrationPpm: item.concentrationPpm, lflVolPercent: item.lflVolPercent })),
        alarmFractions: [lfl.moderate, lfl.high, lfl.critical],
      }).trace;
      const steps: TraceStep[] = items.map((item) =>
        traceStep(
          `${capitalise(item.total.substance.name)} from every open container, at most its own saturated concentration`,
          "Cᵢ = min(C_sat,i, Σ over open containers of min(C_sat, (m/M)·Vm/(1000·V_free) × 10⁶))",
          `${shareText(item.total)}; C = min(${formatSig(item.total.pureSaturatedPpm, 5)}, ${formatSig(item.total.sumPpm, 5)}) = ${formatSig(item.ownPpm, 5)} ppm`,
          traceValue(`Concentration of ${item.total.substance.name}${scale < 1 ? " on its own" : ""}`, "C", item.ownPpm, "ppm"),
        ),
      );
      if (scale < 1) {
        steps.push(
          traceStep(
            "Together more than the whole enclosure: it holds vapor only, each in proportion to its own (Dalton's law)",
            "Cᵢ' = Cᵢ × 10⁶ / Σ Cⱼ when Σ Cⱼ > 10⁶ ppm",
            `Σ C = ${formatSig(sumPpm, 5)} ppm > 10⁶ ppm; factor 10⁶/${formatSig(sumPpm, 5)} = ${formatSig(scale, 4)}; ${items.map((item) => `${item.total.substance.name}: ${formatSig(item.concentrationPpm, 5)} ppm`).join("; ")}`,
            traceValue("Total vapor concentration", "ΣC'", PPM_WHOLE, "ppm"),
          ),
        );
      }
      steps.push(...enclosureSeveritySteps(ctx, fraction, grade));
      return findingTrace({
        rule: "enclosure-lfl",
        scenario: view.scenario,
        method: `${ruleLabel("enclosure-lfl")}: all open containers evaporating together`,
        source: BOUND_SOURCE,
        inputs: [
          worstCaseInput(view),
          traceValue("Ambient pressure", "Patm", ctx.pressureKPa, "kPa", "the site's atmospheric pressure"),
          traceValue("Molar volume at T", "Vm", molarVolumeL, "L/mol", "Vm = R·T/Patm"),
          ...volume.inputs,
          traceValue("Open containers", "n", openContainerIds.length, ""),
          ...lflThresholdInputs(ctx),
        ],
        steps,
        result: traceValue("Fraction of the LFL", "f", percent, "% LFL"),
        parts: [...totals.map((total) => saturationPart(ctx, total.substance, view)), lflTrace],
        warnings: [...volume.warnings, ...lflTemperatureWarnings(view.tempC)],
      });
    },
  });
}
