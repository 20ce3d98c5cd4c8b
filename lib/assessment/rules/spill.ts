/**
 * spill-exposure and spill-lfl: the largest container of each substance or mixture spills in a
 * ventilated room at the room's worst case. The pool spreads to the configured depth (1 cm, EPA
 * RMP guidance), evaporates at the EPA RMP Eq. D-1 rate (or Mackay–Matsugu), and the well-mixed
 * room model gives the concentration: the highest within the short window (15 min) against the
 * STEL, ceiling and IDLH, and the highest overall — the steady state, or what is reached when
 * the pool is gone — against the TWA and as a fraction of the LFL.
 */
import {
  additiveExposureIndex,
  epaRmpEvaporationRate,
  exposureLimitPpm,
  exposureRatios,
  GAS_CONSTANT_J_PER_MOL_K,
  KELVIN_OFFSET,
  KPA_PER_MMHG,
  lflFraction,
  mackayMatsuguEvaporationRate,
  molarVolumeLPerMol,
  spillPoolArea,
  traceStep,
  traceValue,
  wellMixedRoom,
  type ExposureLimit,
  type ExposureLimitKind,
  type Trace,
  type TraceStep,
  type TraceValue,
} from "@/lib/hazard";
import type { Severity } from "@/db/enums";
import { findingTrace, largestByVolume, severityStep, worstCaseInput, type AssessmentContext, type ContentGroup, type MeasuredContainer, type ScenarioView } from "./context";
import { lflSeverityStep, lflTemperatureWarnings, lflThresholdInputs, saturationPart } from "./enclosure";
import { capitalise, formatQuantity, formatSig, formatSignificant, formatTempC } from "./format";
import { ruleLabel } from "./rule-ids";
import { exposureSeverity, lflSeverity, severityRank } from "./severity";
import type { SubstanceSnapshot } from "./types";
import { groupVapor, lflOf, type ComponentVapor, type GroupVapor } from "./vapors";

const M2_PER_FT2 = 0.3048 * 0.3048;
const G_PER_S_PER_LB_PER_MIN = (0.45359237 * 1000) / 60;
const KINDS: readonly ExposureLimitKind[] = ["IDLH", "STEL", "ceiling", "TWA"];

type Room = { volumeM3: number; airChangesPerHour: number; mixingFactor: number; floorAreaM2: number | null };

type ComponentSpill = {
  readonly vapor: ComponentVapor;
  /** The vapor pressure driving evaporation (xᵢ·Pᵢsat, at most the ambient pressure). */
  readonly drivingPressureKPa: number;
  readonly massG: number | null;
  readonly rateGPerS: number;
  readonly evaporatedInS: number | null;
  /** Highest concentration within the short window, ppm. */
  readonly shortPpm: number;
  /** Highest concentration overall: steady state, or at the moment the pool is gone, ppm. */
  readonly longPpm: number;
};

function evaporationRateGPerS(ctx: AssessmentContext, molarMassGPerMol: number, pressureKPa: number, tempC: number, areaM2: number): number {
  const { spill } = ctx.settings;
  const tempK = tempC + KELVIN_OFFSET;
  if (spill.evaporationModel === "mackay-matsugu") {
    const diameterM = Math.sqrt((4 * areaM2) / Math.PI);
    const coefficientMPerS =
      (0.0292 * Math.pow(spill.airSpeedMPerS * 3600, 0.78) * Math.pow(diameterM, -0.11) * Math.pow(spill.schmidtNumber, -0.67)) / 3600;
    return (coefficientMPerS * areaM2 * pressureKPa * 1000 * molarMassGPerMol) / (GAS_CONSTANT_J_PER_MOL_K * tempK);
  }
  // EPA RMP Eq. D-1 in its own units (lb/min, ft², mmHg, K), the same as the engine's.
  const rateLbPerMin =
    (0.284 * Math.pow(spill.airSpeedMPerS, 0.78) * Math.pow(molarMassGPerMol, 2 / 3) * (areaM2 / M2_PER_FT2) * (pressureKPa / KPA_PER_MMHG)) /
    (82.05 * tempK);
  return rateLbPerMin * G_PER_S_PER_LB_PER_MIN;
}

/** C(t) of the well-mixed room from clean air with a constant source, capped at saturation (ppm). */
function wellMixedPpm(rateGPerS: number, room: Room, elapsedS: number | null, molarMassGPerMol: number, molarVolumeL: number, saturatedPpm: number): number {
  const effectiveM3PerS = room.mixingFactor * ((room.airChangesPerHour * room.volumeM3) / 3600);
  const steadyMgPerM3 = (rateGPerS * 1000) / effectiveM3PerS;
  const mgPerM3 = elapsedS === null ? steadyMgPerM3 : steadyMgPerM3 * (1 - Math.exp((-effectiveM3PerS * elapsedS) / room.volumeM3));
  return Math.min((mgPerM3 * molarVolumeL) / molarMassGPerMol, saturatedPpm);
}

function componentSpills(ctx: AssessmentContext, vapor: GroupVapor, container: MeasuredContainer, areaM2: number, room: Room, tempC: number): ComponentSpill[] {
  const molarVolumeL = molarVolumeLPerMol(tempC, ctx.pressureKPa);
  const shortS = ctx.settings.spill.durationMin * 60;
  const overPressure = vapor.totalPressureKPa > ctx.pressureKPa ? ctx.pressureKPa / vapor.totalPressureKPa : 1;
  return vapor.components.map((component) => {
    const molarMass = component.substance.molarMassGPerMol;
    const drivingPressureKPa = component.partialPressureKPa * overPressure;
    const rateGPerS = evaporationRateGPerS(ctx, molarMass, drivingPressureKPa, tempC, areaM2);
    const massG = container.massG === null ? null : container.massG * component.massFraction;
    const evaporatedInS = massG === null || !(rateGPerS > 0) ? null : massG / rateGPerS;
    const shortElapsedS = evaporatedInS === null ? shortS : Math.min(shortS, evaporatedInS);
    return {
      vapor: component,
      drivingPressureKPa,
      massG,
      rateGPerS,
      evaporatedInS,
      shortPpm: wellMixedPpm(rateGPerS, room, shortElapsedS, molarMass, molarVolumeL, component.concentrationPpm),
      longPpm: wellMixedPpm(rateGPerS, room, evaporatedInS, molarMass, molarVolumeL, component.concentrationPpm),
    };
  });
}

/** The most protective limit of each kind, in ppm. */
function controllingLimits(substance: SubstanceSnapshot): Map<ExposureLimitKind, { limit: ExposureLimit; limitPpm: number }> {
  const byKind = new Map<ExposureLimitKind, { limit: ExposureLimit; limitPpm: number }>();
  for (const limit of substance.exposureLimits) {
    const limitPpm = exposureLimitPpm(limit, substance.molarMassGPerMol);
    const current = byKind.get(limit.kind);
    if (current === undefined || limitPpm < current.limitPpm) byKind.set(limit.kind, { limit, limitPpm });
  }
  return byKind;
}

type KindCheck = { kind: ExposureLimitKind; value: number; limitValue: number; ratio: number; severity: Severity | null; label: string };

function worstCheck(checks: KindCheck[]): KindCheck | null {
  let worst: KindCheck | null = null;
  for (const check of checks) {
    if (check.severity === null) continue;
    if (worst === null || severityRank(check.severity) > severityRank(worst.severity as Severity) || (check.severity === worst.severity && check.ratio > worst.ratio)) {
      worst = check;
    }
  }
  return worst;
}

function windowText(kind: ExposureLimitKind, durationMin: number): string {
  return kind === "TWA" ? "at its highest" : `within ${formatSig(durationMin, 3)} minutes`;
}

/** Runs both spill rules for one room. The caller checks that the room is ventilated. */
export function spillRules(ctx: AssessmentContext, roomView: ScenarioView): void {
  const volumeM3 = ctx.room.volumeM3;
  const airChangesPerHour = ctx.room.airChangesPerHour;
  if (volumeM3 === null || airChangesPerHour === null || !(airChangesPerHour > 0)) return;
  if (!(ctx.room.mixingFactor > 0 && ctx.room.mixingFactor <= 1)) {
    ctx.missing({
      kind: "calculation-failed",
      subject: { kind: "location", key: "mixing-factor" },
      subjectName: ctx.label,
      scenario: "spill",
      what: `a mixing factor of ${ctx.room.mixingFactor}, outside 0 < k ≤ 1 (k multiplies the ventilation rate)`,
      consequence: "no spill is modelled in it",
    });
    return;
  }
  const room: Room = { volumeM3, airChangesPerHour, mixingFactor: ctx.room.mixingFactor, floorAreaM2: ctx.room.floorAreaM2 };
  const view: ScenarioView = { ...roomView, scenario: "spill" };
  const { spill, exposure } = ctx.settings;
  const maxAreaM2 = spill.limitPoolToFloorArea && room.floorAreaM2 !== null && room.floorAreaM2 > 0 ? room.floorAreaM2 : undefined;
  const noLimitNeeded = new Set(exposure.noLimitNeededCas);
  for (const group of ctx.liquidGroups()) {
    const container = largestByVolume(group);
    if (container.volumeL === null || !(container.volumeL > 0)) continue;
    const vapor = groupVapor(ctx, group, view.tempC, "spill");
    if (vapor === null) continue;
    const spreadAreaM2 = container.volumeL / 1000 / spill.poolDepthM;
    const areaM2 = maxAreaM2 !== undefined && maxAreaM2 < spreadAreaM2 ? maxAreaM2 : spreadAreaM2;
    const spills = componentSpills(ctx, vapor, container, areaM2, room, view.tempC);
    const lfls = vapor.components.map((c) => lflOf(ctx, c.substance, group, "spill"));
    const limits = vapor.components.map((c) => controllingLimits(c.substance));
    vapor.components.forEach((c, i) => {
      if (limits[i].size === 0 && !(c.substance.cas !== null && noLimitNeeded.has(c.substance.cas))) {
        ctx.missing({
          kind: "no-exposure-limit",
          subject: { kind: "substance", id: c.substance.id },
          subjectName: c.substance.name,
          scenario: "spill",
          what: "no exposure limit (TWA, STEL, ceiling or IDLH)",
          consequence: "a spill of it is assessed against the LFL only",
          substanceId: c.substance.id,
          containerIds: group.containers.map((m) => m.liquid.containerId),
        });
      }
    });
    const checks = exposureChecks(ctx, group, spills, limits);
    const exposureWorst = worstCheck(checks);
    const lflItems = spills.flatMap((s, i) => (lfls[i] === null ? [] : [{ spill: s, index: i, lflVolPercent: lfls[i] as number }]));
    let lflFractionQuick = 0;
    for (const item of lflItems) lflFractionQuick += item.spill.longPpm / (item.lflVolPercent * 10_000);
    const lflSeverityFound = lflItems.length > 0 ? lflSeverity(lflFractionQuick, ctx.settings) : null;
    if (exposureWorst === null && lflSeverityFound === null) continue;

    // The engine's traces, built once for both findings when a trace is first read.
    let parts: EngineParts | null = null;
    const engine = () => (parts ??= engineParts(ctx, container, spills, areaM2, maxAreaM2, room, view));
    if (exposureWorst) exposureFinding(ctx, group, container, spills, limits, checks, exposureWorst, engine, view, areaM2);
    if (lflSeverityFound) lflFinding(ctx, group, container, lflItems, lflFractionQuick, lflSeverityFound, engine, view, areaM2);
  }
}

type EngineParts = ReturnType<typeof engineParts>;

function exposureChecks(
  ctx: AssessmentContext,
  group: ContentGroup,
  spills: ComponentSpill[],
  limits: Map<ExposureLimitKind, { limit: ExposureLimit; limitPpm: number }>[],
): KindCheck[] {
  const checks: KindCheck[] = [];
  const pure = group.content.kind === "substance";
  for (const kind of KINDS) {
    let index = 0;
    let counted = 0;
    let body = "";
    spills.forEach((s, i) => {
      const entry = limits[i].get(kind);
      if (entry === undefined) return;
      const concentration = kind === "TWA" ? s.longPpm : s.shortPpm;
      index += concentration / entry.limitPpm;
      counted += 1;
      body = entry.limit.body ?? "";
    });
    if (counted === 0) continue;
    if (pure) {
      const entry = limits[0].get(kind) as { limit: ExposureLimit; limitPpm: number };
      const value = kind === "TWA" ? spills[0].longPpm : spills[0].shortPpm;
      checks.push({ kind, value, limitValue: entry.limitPpm, ratio: index, severity: exposureSeverity(kind, index, ctx.settings), label: `${body ? `${body} ` : ""}${kind}` });
    } else {
      checks.push({ kind, value: index, limitValue: 1, ratio: index, severity: exposureSeverity(kind, index, ctx.settings), label: `additive ${kind} index` });
    }
  }
  return checks;
}

function engineParts(
  ctx: AssessmentContext,
  container: MeasuredContainer,
  spills: ComponentSpill[],
  areaM2: number,
  maxAreaM2: number | undefined,
  room: Room,
  view: ScenarioView,
): { pool: Trace; perComponent: { evaporation: Trace; short: Trace; long: Trace; rateGPerS: number; shortPpm: number; longPpm: number }[] } {
  const { spill } = ctx.settings;
  const pool = spillPoolArea({ volumeL: container.volumeL as number, depthM: spill.poolDepthM, maxAreaM2 }).trace;
  const shortS = spill.durationMin * 60;
  const perComponent = spills.map((s) => {
    const substance = s.vapor.substance;
    const poolInput = {
      molarMassGPerMol: substance.molarMassGPerMol,
      vaporPressureKPa: s.drivingPressureKPa,
      tempC: view.tempC,
      poolAreaM2: areaM2,
      windSpeedMPerS: spill.airSpeedMPerS,
    };
    const evaporation =
      spill.evaporationModel === "mackay-matsugu" ? mackayMatsuguEvaporationRate({ ...poolInput, schmidtNumber: spill.schmidtNumber }) : epaRmpEvaporationRate(poolInput);
    const base = {
      generationRateGPerS: evaporation.rateGPerS,
      roomVolumeM3: room.volumeM3,
      airChangesPerHour: room.airChangesPerHour,
      mixingFactor: room.mixingFactor,
      molarMassGPerMol: substance.molarMassGPerMol,
      tempC: view.tempC,
      ambientPressureKPa: ctx.pressureKPa,
      saturatedPpm: s.vapor.concentrationPpm,
    };
    const evaporatedInS = s.massG === null ? null : s.massG / evaporation.rateGPerS;
    const short = wellMixedRoom({ ...base, elapsedS: evaporatedInS === null ? shortS : Math.min(shortS, evaporatedInS) });
    const long = wellMixedRoom(evaporatedInS === null ? base : { ...base, elapsedS: evaporatedInS });
    return {
      evaporation: { ...evaporation.trace, method: `${evaporation.trace.method}: ${substance.name}` },
      short: { ...short.trace, method: `${short.trace.method}: ${substance.name}, highest within ${formatSig(spill.durationMin, 3)} min` },
      long: { ...long.trace, method: `${long.trace.method}: ${substance.name}, highest overall` },
      rateGPerS: evaporation.rateGPerS,
      shortPpm: short.atElapsedPpm as number,
      longPpm: (long.atElapsedPpm ?? long.steadyStatePpm) as number,
    };
  });
  return { pool, perComponent };
}

function spillInputs(ctx: AssessmentContext, group: ContentGroup, container: MeasuredContainer, spills: ComponentSpill[], view: ScenarioView, areaM2: number): TraceValue[] {
  const { spill } = ctx.settings;
  return [
    worstCaseInput(view),
    traceValue("Spilled container (the largest of its content)", "container", container.liquid.label, "", `${formatSig(container.volumeL as number, 4)} L of ${group.name}`),
    traceValue("Pool area", "A", areaM2, "m²"),
    traceValue("Room volume", "V", ctx.room.volumeM3 as number, "m³"),
    traceValue("Air changes per hour", "ACH", ctx.room.airChangesPerHour as number, "1/h"),
    traceValue("Mixing factor (multiplies Q)", "k", ctx.room.mixingFactor, ""),
    traceValue("Air speed over the pool", "U", spill.airSpeedMPerS, "m/s", "settings: spill assumptions (their source is the trace's source)"),
    traceValue("Short-term window", "t_short", spill.durationMin, "min", "settings: spill assumptions (their source is the trace's source)"),
    ...spills.map((s) =>
      traceValue(
        `Time for ${s.vapor.substance.name} to evaporate`,
        "t_evap",
        s.evaporatedInS ?? "unknown (mass unknown)",
        s.evaporatedInS === null ? "" : "s",
        "t_evap = m/G",
      ),
    ),
  ];
}

function exposureFinding(
  ctx: AssessmentContext,
  group: ContentGroup,
  container: MeasuredContainer,
  spills: ComponentSpill[],
  limits: Map<ExposureLimitKind, { limit: ExposureLimit; limitPpm: number }>[],
  checks: KindCheck[],
  worst: KindCheck,
  engine: () => EngineParts,
  view: ScenarioView,
  areaM2: number,
): void {
  const { spill, exposure } = ctx.settings;
  const pure = group.content.kind === "substance";
  const severity = worst.severity as Severity;
  const volumeText = formatQuantity(container.volumeL as number, "L");
  const title = pure
    ? `A ${volumeText} spill of ${group.name} in ${ctx.label} could reach ${formatSignificant(worst.ratio * 100)} % of the ${worst.label} ${windowText(worst.kind, spill.durationMin)} (spill, ${formatTempC(view.tempC)})`
    : `A ${volumeText} spill of ${group.name} in ${ctx.label} could reach an ${worst.label} of ${formatSignificant(worst.ratio)} ${windowText(worst.kind, spill.durationMin)} (spill, ${formatTempC(view.tempC)})`;
  ctx.finding({
    rule: "spill-exposure",
    severity,
    scenario: "spill",
    subject: group.subject,
    title,
    containerId: container.liquid.containerId,
    substanceId: group.substanceId,
    mixtureId: group.mixtureId,
    value: worst.value,
    limitValue: worst.limitValue,
    ratio: worst.ratio,
    unit: pure ? "ppm" : "index",
    view,
    containerIds: group.containers.map((c) => c.liquid.containerId),
    trace: () => {
      const parts = engine();
      const limitParts: Trace[] = [];
      for (const kind of KINDS) {
        if (pure) {
          const entry = limits[0].get(kind);
          if (!entry) continue;
          const concentrationPpm = kind === "TWA" ? parts.perComponent[0].longPpm : parts.perComponent[0].shortPpm;
          const ratios = exposureRatios({ concentrationPpm, molarMassGPerMol: spills[0].vapor.substance.molarMassGPerMol, limits: [entry.limit] });
          limitParts.push({ ...ratios.trace, method: `${ratios.trace.method}: ${kind} against the ${kind === "TWA" ? "highest overall" : "short-window"} concentration` });
        } else {
          const components = spills.flatMap((s, i) => {
            const entry = limits[i].get(kind);
            const p = parts.perComponent[i];
            return entry ? [{ name: s.vapor.substance.name, concentrationPpm: kind === "TWA" ? p.longPpm : p.shortPpm, molarMassGPerMol: s.vapor.substance.molarMassGPerMol, limit: entry.limit }] : [];
          });
          if (components.length > 0) limitParts.push(additiveExposureIndex(components).trace);
        }
      }
      const steps: TraceStep[] = checks.map((check) =>
        traceStep(
          `Ratio to the controlling ${check.label} (${windowText(check.kind, spill.durationMin)})`,
          pure ? "r = C / L" : "E = Σ Cᵢ/Lᵢ",
          `r = ${formatSig(check.value, 4)} / ${formatSig(check.limitValue, 4)} = ${formatSig(check.ratio, 4)}${check.severity ? ` → ${check.severity}` : ""}`,
          traceValue(`Ratio to ${check.label}`, "r", check.ratio, ""),
        ),
      );
      steps.push(
        severityStep(
          "Severity: the worst of the limits (exceeded above 1; the action level at or above its fraction of the TWA)",
          `IDLH > 1 → ${exposure.idlhSeverity}; STEL > 1 → ${exposure.stelSeverity}; ceiling > 1 → ${exposure.ceilingSeverity}; TWA > 1 → ${exposure.twaSeverity}${exposure.twaActionFraction !== null ? `; TWA ≥ ${exposure.twaActionFraction} → ${exposure.actionSeverity}` : ""}`,
          `${worst.label}: r = ${formatSig(worst.ratio, 4)} → ${severity}`,
          severity,
          exposure.source,
        ),
      );
      return findingTrace({
        rule: "spill-exposure",
        scenario: "spill",
        method: `${ruleLabel("spill-exposure")}: ${group.name}`,
        source: spill.source,
        inputs: [
          ...spillInputs(ctx, group, container, spills, view, areaM2),
          ...checks.map((check) => traceValue(`Controlling ${check.label}`, `L_${check.kind}`, check.limitValue, pure ? "ppm" : "")),
        ],
        steps,
        result: traceValue(`Ratio to the ${worst.label}`, "r", worst.ratio, ""),
        // The substances' own vapor pressures (correlation, coefficients, range, source) close the parts.
        parts: [parts.pool, ...parts.perComponent.flatMap((p) => [p.evaporation, p.short, p.long]), ...limitParts, ...spills.map((s) => saturationPart(ctx, s.vapor.substance, view))],
        warnings:
          group.content.kind === "mixture"
            ? ["The mole fractions of the spilled mixture are held constant while it evaporates (screening)", ...group.content.mixture.warnings]
            : [],
      });
    },
  });
}

function lflFinding(
  ctx: AssessmentContext,
  group: ContentGroup,
  container: MeasuredContainer,
  items: { spill: ComponentSpill; index: number; lflVolPercent: number }[],
  fraction: number,
  severity: Severity,
  engine: () => EngineParts,
  view: ScenarioView,
  areaM2: number,
): void {
  const percent = fraction * 100;
  ctx.finding({
    rule: "spill-lfl",
    severity,
    scenario: "spill",
    subject: group.subject,
    title: `A ${formatQuantity(container.volumeL as number, "L")} spill of ${group.name} in ${ctx.label} could reach ${formatSignificant(percent)} % LFL (spill, ${formatTempC(view.tempC)})`,
    containerId: container.liquid.containerId,
    substanceId: group.substanceId,
    mixtureId: group.mixtureId,
    value: percent,
    limitValue: 100,
    ratio: fraction,
    unit: "% LFL",
    view,
    containerIds: group.containers.map((c) => c.liquid.containerId),
    trace: () => {
      const parts = engine();
      const { lfl } = ctx.settings;
      const lflTrace = lflFraction({
        components: items.map((item) => ({
          name: item.spill.vapor.substance.name,
          concentrationPpm: parts.perComponent[item.index].longPpm,
          lflVolPercent: item.lflVolPercent,
        })),
        alarmFractions: [lfl.moderate, lfl.high, lfl.critical],
      }).trace;
      return findingTrace({
        rule: "spill-lfl",
        scenario: "spill",
        method: `${ruleLabel("spill-lfl")}: ${capitalise(group.name)}`,
        source: `${ctx.settings.spill.source} Fraction of the LFL: Σ Cᵢ/LFLᵢ (Le Chatelier's rule, additive form).`,
        inputs: [...spillInputs(ctx, group, container, items.map((item) => item.spill), view, areaM2), ...lflThresholdInputs(ctx)],
        steps: [lflSeverityStep(ctx, fraction, severity)],
        result: traceValue("Fraction of the LFL", "f", percent, "% LFL"),
        parts: [parts.pool, ...parts.perComponent.flatMap((p) => [p.evaporation, p.long]), lflTrace, ...items.map((item) => saturationPart(ctx, item.spill.vapor.substance, view))],
        warnings: [...lflTemperatureWarnings(view.tempC), "The room-average concentration: near the pool it is higher, and vapor heavier than air collects low"],
      });
    },
  });
}
