/**
 * Time to danger: for each control-lost finding of a temperature-controlled unit, the temperatures
 * at which its contents cross each severity threshold on the way from the unit's in-control worst
 * case to its control-lost worst case, and, from the unit's warm-up (Newton's law of heating
 * towards its room's worst case, τ set, fitted to its recorded failures or its kind's default), the
 * minutes after a failure at which each is crossed.
 *
 * - Flash point: the threshold temperatures are the flash point and the margin below it.
 * - Boiling point: the boiling temperature at the site's pressure.
 * - Vapor in a closed unit (fraction of the LFL): the rule itself is evaluated on a temperature grid
 *   (at most 5 °C apart) with every alarm fraction lowered so that it reports the fraction at
 *   every point, and the temperature where the fraction reaches each alarm fraction is found by
 *   interpolating ln(fraction) linearly between the two grid points around it — the vapor-pressure
 *   correlation inverted, for one substance, a mixture (Raoult, Le Chatelier) or a group of open
 *   containers alike. ln Psat is so nearly linear over 5 °C that the interpolation is within a few
 *   hundredths of a degree of the exact inversion (tested against the correlation solved for T).
 */
import type { Severity } from "@/db/enums";
import { traceStep, traceValue, warmUpMinutesToReach, type TraceStep, type TraceValue } from "@/lib/hazard";
import { brokenBottles, type BrokenBottle } from "./broken-bottle";
import { createAssessmentCache } from "./cache";
import { AssessmentContext, Finding, isClosedUnit, type ScenarioView } from "./context";
import { enclosureRule } from "./enclosure";
import { formatSig, formatTempC } from "./format";
import { unitEnclosureVolume } from "./missing-data";
import { flashPointSeverity, severityRank } from "./severity";
import type { AssessmentSettings, LocationSnapshot, TimeToDanger } from "./types";

/** The rules whose severity depends on the temperature under control lost. */
const TEMPERATURE_RULES: ReadonlySet<string> = new Set(["enclosure-lfl", "flash-point", "boiling-point"]);
/** The widest step of the temperature grid for the vapor rule. */
const GRID_STEP_C = 5;

export type ThresholdCrossing = {
  severity: Severity;
  /** Short label, e.g. "25 % LFL", "LFL", "flash point", "boiling point". */
  threshold: string;
  tempC: number;
  /** After the failure; 0 when crossed at the start; null when the unit never warms that far. */
  minutes: number | null;
};

/** "3 h 10 min", "45 min", "under 1 min" (the register's duration format). */
export function formatMinutes(minutes: number): string {
  if (minutes > 0 && minutes < 1) return "under 1 min";
  // As lib/format/numbers formatDurationMin (the rules import nothing from the app).
  const total = Math.max(0, Math.round(minutes));
  if (total < 60) return `${total} min`;
  const days = Math.floor(total / 1440);
  const hours = Math.floor((total % 1440) / 60);
  const mins = total % 60;
  if (days > 0) return `${days} day${days === 1 ? "" : "s"}${hours ? ` ${hours} h` : ""}`;
  return `${hours} h${mins ? ` ${mins} min` : ""}`;
}

/** A temperature for a subtraction: negative values in brackets. */
function signed(tempC: number): string {
  return tempC < 0 ? `(${formatSig(tempC, 4)})` : formatSig(tempC, 4);
}

function lflLabel(fraction: number): string {
  return fraction === 1 ? "LFL" : `${formatSig(fraction * 100, 3)} % LFL`;
}

/** The vapor rule's fraction of the LFL (in % LFL) for every subject at each temperature, whatever its size: one context, cleared between temperatures. */
function lflPercentOnGrid(snapshot: LocationSnapshot, sensitive: AssessmentSettings, temps: readonly number[]): Map<string, number>[] {
  const ctx = new AssessmentContext(snapshot, sensitive, createAssessmentCache());
  const unit = ctx.unit;
  if (unit === null || !isClosedUnit(unit) || ctx.liquidGroups().length === 0) return temps.map(() => new Map());
  const volume = unitEnclosureVolume(ctx, unit);
  if (!volume) return temps.map(() => new Map());
  return temps.map((tempC) => {
    ctx.clearFindings();
    enclosureRule(ctx, { scenario: "control_lost", tempC, source: "", phrase: "" }, volume);
    const out = new Map<string, number>();
    for (const finding of ctx.results()) {
      if (finding.rule === "enclosure-lfl" && finding.scenario === "control_lost" && finding.value !== null) out.set(finding.fingerprint, finding.value);
    }
    return out;
  });
}

/** Where a rising series first reaches `target`, by linear interpolation of ln(value) between grid points; null if it never does. */
function crossingOnGrid(temps: readonly number[], values: readonly (number | undefined)[], target: number): number | null {
  for (let k = 0; k < temps.length; k += 1) {
    const v = values[k];
    if (v === undefined || v < target) continue;
    if (k === 0) return temps[0];
    const before = values[k - 1];
    if (before === undefined || !(before > 0)) return temps[k - 1];
    const share = (Math.log(target) - Math.log(before)) / (Math.log(v) - Math.log(before));
    return temps[k - 1] + Math.min(1, Math.max(0, share)) * (temps[k] - temps[k - 1]);
  }
  return null;
}

/**
 * Sets `timeToDanger` (and its trace steps) on the control-lost findings of a temperature-controlled
 * unit with a warm-up. `findings` are the unit's results from the main run.
 */
export function attachTimeToDanger(
  snapshot: LocationSnapshot,
  settings: AssessmentSettings,
  findings: readonly Finding[],
  views: { inControl: ScenarioView | null; controlLost: ScenarioView | null },
): void {
  if (snapshot.kind !== "unit") return;
  const warmUp = snapshot.unit.warmUp ?? null;
  const lost = views.controlLost;
  if (warmUp === null || lost === null) return;
  const targets = findings.filter((f) => f.scenario === "control_lost" && TEMPERATURE_RULES.has(f.rule));
  if (targets.length === 0) return;
  const startTempC = views.inControl?.tempC ?? snapshot.unit.setRange?.maxC ?? null;
  if (startTempC === null) return;
  const roomTempC = snapshot.room.worstCase?.tempC ?? null;
  const highTempC = Math.max(lost.tempC, startTempC);
  const unit = snapshot.unit;
  const ignitionFree = unit.ignitionSourceFree && isClosedUnit(unit);

  const warm = roomTempC !== null && roomTempC > startTempC ? { roomTempC, startTempC, tauMin: warmUp.tauMin } : null;
  const minutesTo = (tempC: number): number | null => {
    if (tempC <= startTempC) return 0;
    if (warm === null) return null;
    return warmUpMinutesToReach(warm, tempC);
  };
  const crossing = (severity: Severity, threshold: string, tempC: number): ThresholdCrossing => {
    const at = Math.max(startTempC, tempC);
    return { severity, threshold, tempC: at, minutes: minutesTo(at) };
  };

  // The vapor rule on a grid, once for all its findings in this unit.
  let grid: { temps: number[]; values: Map<string, number>[] } | null = null;
  const vaporGrid = () => {
    if (grid) return grid;
    const steps = Math.max(1, Math.ceil((highTempC - startTempC) / GRID_STEP_C));
    const temps = Array.from({ length: steps + 1 }, (_, k) => startTempC + ((highTempC - startTempC) * k) / steps);
    const sensitive: AssessmentSettings = { ...settings, lfl: { ...settings.lfl, moderate: Number.MIN_VALUE, high: Math.max(settings.lfl.high, Number.MIN_VALUE) } };
    grid = { temps, values: lflPercentOnGrid(snapshot, sensitive, temps) };
    return grid;
  };

  // The same problem in control (its fingerprint differs only by the scenario): already as bad at the start?
  const inControlSeverity = new Map<string, Severity>();
  for (const f of findings) if (f.scenario === "in_control") inControlSeverity.set(f.fingerprint.slice(0, -"in_control".length), f.severity);
  const severityAtStart = (finding: Finding) => inControlSeverity.get(finding.fingerprint.slice(0, -"control_lost".length)) ?? null;

  // A broken bottle inside, for the vapor findings' traces: computed only when a trace is read.
  let bottleMemo: BrokenBottle[] | null = null;
  const bottles = () => (bottleMemo ??= brokenBottles(snapshot, settings) ?? []);

  for (const finding of targets) {
    const finalRank = severityRank(finding.severity);
    const crossings: ThresholdCrossing[] = [];
    const startSeverity = views.inControl && views.inControl.tempC >= startTempC ? severityAtStart(finding) : null;
    if (finding.rule === "enclosure-lfl" && startSeverity !== null && severityRank(startSeverity) >= finalRank) {
      // As bad in control as with control lost: the danger is there before any failure.
      const fraction = finding.severity === "critical" ? settings.lfl.critical : finding.severity === "high" ? settings.lfl.high : settings.lfl.moderate;
      crossings.push(crossing(finding.severity, lflLabel(fraction), startTempC));
    } else if (finding.rule === "flash-point" && finding.limitValue !== null) {
      const flashPointC = finding.limitValue;
      const margin = settings.flashPoint.marginC;
      const near = flashPointSeverity(flashPointC - margin, flashPointC, settings, ignitionFree);
      const at = flashPointSeverity(flashPointC, flashPointC, settings, ignitionFree);
      if (near !== null) crossings.push(crossing(near, `within ${formatSig(margin, 3)} °C of the flash point`, flashPointC - margin));
      if (at !== null && (near === null || severityRank(at) > severityRank(near))) crossings.push(crossing(at, "flash point", flashPointC));
    } else if (finding.rule === "boiling-point") {
      crossings.push(crossing(finding.severity, "boiling point", finding.limitValue ?? highTempC));
    } else if (finding.rule === "enclosure-lfl") {
      const { temps, values } = vaporGrid();
      const series = values.map((v) => v.get(finding.fingerprint));
      const cap = settings.lfl.ignitionFreeMaxSeverity;
      const levels: [Severity, number][] = [
        ["moderate", settings.lfl.moderate],
        ["high", settings.lfl.high],
        ["critical", settings.lfl.critical],
      ];
      for (const [level, fraction] of levels) {
        const severity: Severity = unit.ignitionSourceFree && severityRank(level) > severityRank(cap) ? cap : level;
        if (severityRank(severity) > finalRank) break;
        if (crossings.some((c) => c.severity === severity)) continue;
        const tempC = crossingOnGrid(temps, series, fraction * 100);
        if (tempC !== null) crossings.push(crossing(severity, lflLabel(fraction), tempC));
      }
    }
    // A threshold reached already at the start: collapse to the highest such one.
    const atStart = crossings.filter((c) => c.minutes === 0);
    const kept = atStart.length > 1 ? [atStart.at(-1)!, ...crossings.filter((c) => c.minutes !== 0)] : crossings;
    const own = kept.find((c) => severityRank(c.severity) >= finalRank) ?? null;
    const value: TimeToDanger | null =
      own !== null && own.minutes !== null ? { minutes: Math.round(own.minutes * 10) / 10, threshold: own.threshold, tempC: Math.round(own.tempC * 100) / 100 } : null;
    finding.thresholdTemps = kept.map((c) => ({ severity: c.severity, threshold: c.threshold, tempC: c.tempC }));
    finding.setTimeToDanger(value, () => {
      const trace = {
        ...timeToDangerTrace({ crossings: kept, startTempC, roomTempC, warmUp, views, warm }),
        crossings: kept.map((c) => ({ severity: c.severity, threshold: c.threshold, tempC: c.tempC, minutes: c.minutes === null ? null : Math.round(c.minutes * 10) / 10 })),
      };
      const bottle = finding.rule === "enclosure-lfl" && finding.substanceId !== null ? bottles().find((b) => b.substanceId === finding.substanceId) : undefined;
      if (!bottle) return trace;
      return { ...trace, steps: [...trace.steps, brokenBottleStep(bottle)], parts: [bottle.result.trace] };
    });
  }
}

function timeToDangerTrace(input: {
  crossings: ThresholdCrossing[];
  startTempC: number;
  roomTempC: number | null;
  warmUp: NonNullable<Extract<LocationSnapshot, { kind: "unit" }>["unit"]["warmUp"]>;
  views: { inControl: ScenarioView | null; controlLost: ScenarioView | null };
  warm: { roomTempC: number; startTempC: number; tauMin: number } | null;
}): { steps: TraceStep[]; inputs: TraceValue[]; warnings: string[] } {
  const { crossings, startTempC, roomTempC, warmUp, warm } = input;
  const inputs: TraceValue[] = [
    traceValue("Temperature when the cooling fails", "T_start", startTempC, "°C", input.views.inControl?.source ?? "upper end of the set range"),
    ...(roomTempC !== null ? [traceValue("Temperature it warms towards (the room's worst case)", "T_room", roomTempC, "°C", "the room's worst case")] : []),
    traceValue("Warm-up time constant", "τ", warmUp.tauMin, "min", warmUp.reason),
  ];
  const thresholds = crossings
    .map((c) => `${c.threshold} (${c.severity}) at ${formatTempC(c.tempC)}${c.tempC <= startTempC ? " — already at the start" : ""}`)
    .join("; ");
  const steps: TraceStep[] = [
    traceStep(
      "Threshold temperatures: the rule's calculation solved for T between the in-control and the control-lost worst case",
      "T* where the vapor reaches each LFL alarm fraction f (Psat(T*)/Patm = f × LFL, ln-interpolated on a grid ≤ 5 °C), the flash point (and the margin below it), the boiling point",
      thresholds || "no threshold between the two temperatures",
      traceValue("Threshold temperatures", "T*", crossings.map((c) => formatSig(c.tempC, 4)).join(", ") || "—", "°C"),
    ),
  ];
  if (warm) {
    const times = crossings
      .map((c) =>
        c.minutes === null
          ? `${c.threshold}: not reached by warming to ${formatTempC(warm.roomTempC)}`
          : c.minutes === 0
            ? `${c.threshold}: already at the start`
            : `${c.threshold}: t = −${formatSig(warm.tauMin, 4)} × ln((${formatSig(warm.roomTempC, 4)} − ${signed(c.tempC)})/(${formatSig(warm.roomTempC, 4)} − ${signed(warm.startTempC)})) = ${formatSig(c.minutes, 4)} min (${formatMinutes(c.minutes)})`,
      )
      .join("; ");
    steps.push(
      traceStep(
        "Warm-up after a failure (Newton's law of heating): time at which each threshold temperature is reached",
        "T(t) = T_room − (T_room − T_start)·e^(−t/τ) ⇒ t = −τ·ln((T_room − T*)/(T_room − T_start))",
        times || "—",
        traceValue("Time to danger", "t", crossings.find((c) => c.minutes !== null && c.minutes > 0)?.minutes ?? "—", "min"),
      ),
    );
  }
  const warnings = [
    "Time to danger is a screening estimate from a single time constant: how the unit is loaded, opened and placed changes it; act on a failure at once.",
  ];
  if (!warm) warnings.push("The room's worst case is not above the start temperature, so no warm-up time can be computed.");
  if (crossings.some((c) => c.minutes === null && c.tempC > startTempC))
    warnings.push(`Thresholds above the room's worst case (${roomTempC === null ? "unknown" : formatTempC(roomTempC)}) are reached only in a recorded excursion peak, not by warming to the room.`);
  return { steps, inputs, warnings };
}

/** "A broken 1 L bottle of diethyl ether reaches 25 % LFL after 2 min and the LFL after 9 min." */
export function brokenBottleSentence(bottle: BrokenBottle): string {
  const size = bottle.volumeL >= 1 ? `${formatSig(bottle.volumeL, 3)} L` : `${formatSig(bottle.volumeL * 1000, 3)} mL`;
  const parts = bottle.result.times.map((t) => {
    const label = t.lflFraction === 1 ? "the LFL" : `${formatSig(t.lflFraction * 100, 3)} % LFL`;
    if (t.minutes === null) return `never ${label} (${t.limitedBy === "saturation" ? "its vapor pressure is too low" : "the bottle holds too little"})`;
    return t.minutes < 1 ? `${label} in under a minute` : `${label} within about ${formatMinutes(t.minutes)}`;
  });
  return `A broken ${size} bottle of ${bottle.name} (${bottle.containerLabel}) at ${formatTempC(bottle.tempC)}: ${parts.join(", ")}.`;
}

function brokenBottleStep(bottle: BrokenBottle): TraceStep {
  return traceStep(
    "If the largest bottle broke inside (at the in-control worst case): pool evaporation into the still air of the unit",
    "p(t) = Psat·(1 − e^(−t/θ)); t = −θ·ln(1 − f·LFL·Patm/Psat)",
    brokenBottleSentence(bottle),
    traceValue("Broken bottle: time to 25 % LFL", "t_25", bottle.result.times[0]?.minutes ?? "never", "min"),
  );
}
