/**
 * What every rule shares while one location is assessed: the location, its scenarios, its
 * contents turned into litres and grams and grouped by what they hold, the memo of engine results,
 * and the collector of findings (one per fingerprint).
 */
import type { Scenario, Severity, StorageUnitKind } from "@/db/enums";
import { HazardInputError, traceStep, traceValue, type Trace, type TraceStep, type TraceValue } from "@/lib/hazard";
import { cachedSaturation, type AssessmentCache, type SaturationEntry } from "./cache";
import { findingFingerprint, subjectKey, type FindingSubject, type LocationRef } from "./fingerprint";
import type { RuleId } from "./rule-ids";
import type {
  AssessmentSettings,
  CandidateFinding,
  FindingTrace,
  PlainCandidateFinding,
  LocationSnapshot,
  MissingDataKind,
  RoomInfo,
  StoredContent,
  StoredLiquid,
  SubstanceSnapshot,
  TimeToDanger,
  TraceContainer,
  UnitInfo,
} from "./types";

// ---------------------------------------------------------------------------------------------
// Kinds of units
// ---------------------------------------------------------------------------------------------

const REFRIGERATORS: ReadonlySet<StorageUnitKind> = new Set(["domestic_refrigerator", "flammable_storage_refrigerator", "explosion_proof_refrigerator"]);
const FREEZERS: ReadonlySet<StorageUnitKind> = new Set(["freezer_minus_20", "freezer_minus_80"]);
/** Units that close: vapor accumulates in their interior. */
const CLOSED_KINDS: ReadonlySet<StorageUnitKind> = new Set([
  "flammable_cabinet",
  "corrosives_cabinet",
  "domestic_refrigerator",
  "flammable_storage_refrigerator",
  "explosion_proof_refrigerator",
  "freezer_minus_20",
  "freezer_minus_80",
]);

/** A refrigerator or freezer, or any unit with a set range: assessed in control and with control lost. */
export function isTemperatureControlled(unit: UnitInfo): boolean {
  const range = unit.setRange;
  return (range !== null && (range.minC !== null || range.maxC !== null)) || REFRIGERATORS.has(unit.kind) || FREEZERS.has(unit.kind);
}

/** A closed, unventilated unit; "other" counts as closed when it has an internal volume. */
export function isClosedUnit(unit: UnitInfo): boolean {
  if (unit.ventilated) return false;
  return CLOSED_KINDS.has(unit.kind) || (unit.kind === "other" && unit.internalVolumeL !== null);
}

export function unitNoun(kind: StorageUnitKind): string {
  if (REFRIGERATORS.has(kind)) return "refrigerator";
  if (FREEZERS.has(kind)) return "freezer";
  return "unit's temperature control";
}

export const UNIT_KIND_LABELS: Record<StorageUnitKind, string> = {
  open_shelving: "open shelving",
  flammable_cabinet: "flammable-liquid cabinet",
  corrosives_cabinet: "corrosives cabinet",
  ventilated_cabinet: "ventilated cabinet",
  domestic_refrigerator: "domestic-type refrigerator",
  flammable_storage_refrigerator: "flammable-storage refrigerator",
  explosion_proof_refrigerator: "explosion-proof refrigerator",
  freezer_minus_20: "−20 °C freezer",
  freezer_minus_80: "−80 °C freezer",
  cryogen_area: "cryogen area",
  fume_hood: "fume hood",
  other: "other unit",
};

// ---------------------------------------------------------------------------------------------
// Scenarios
// ---------------------------------------------------------------------------------------------

/** One scenario with its worst-case temperature, ready for the rules. */
export type ScenarioView = {
  readonly scenario: Scenario;
  readonly tempC: number;
  /** Where the temperature came from (the worst case's description). */
  readonly source: string;
  /** For titles, e.g. "if the refrigerator fails (control lost, 21.3 °C)". */
  readonly phrase: string;
};

// ---------------------------------------------------------------------------------------------
// Contents
// ---------------------------------------------------------------------------------------------

export type MeasuredContainer = {
  readonly liquid: StoredLiquid;
  readonly volumeL: number | null;
  readonly massG: number | null;
  readonly open: boolean;
};

/** The containers that hold the same substance or mixture. */
export type ContentGroup = {
  readonly key: string;
  readonly content: StoredContent;
  readonly name: string;
  readonly subject: FindingSubject;
  readonly substanceId: number | null;
  readonly mixtureId: number | null;
  readonly physicalState: SubstanceSnapshot["physicalState"];
  readonly containers: MeasuredContainer[];
  /** The group's vapor at each temperature already asked for (vapors.ts; at most a few per location). */
  readonly vaporMemo: { tempC: number; vapor: unknown }[];
};

function densityOf(content: StoredContent): number | null {
  return content.kind === "substance" ? content.substance.liquidDensityKgPerM3 : content.mixture.liquidDensityKgPerM3;
}

function contentName(content: StoredContent): string {
  return content.kind === "substance" ? content.substance.name : content.mixture.name;
}

function measure(liquid: StoredLiquid): MeasuredContainer {
  const density = densityOf(liquid.content);
  let volumeL: number | null = null;
  let massG: number | null = null;
  switch (liquid.amountUnit) {
    case "mL":
      volumeL = liquid.amount / 1000;
      break;
    case "L":
      volumeL = liquid.amount;
      break;
    case "g":
      massG = liquid.amount;
      break;
    default:
      massG = liquid.amount * 1000;
  }
  // kg/m³ is g/L.
  if (volumeL !== null && density !== null && density > 0) massG = volumeL * density;
  else if (massG !== null && density !== null && density > 0) volumeL = massG / density;
  return { liquid, volumeL, massG, open: liquid.state === "opened" || liquid.state === "in_use" };
}

export function largestByMass(group: ContentGroup): MeasuredContainer {
  let best = group.containers[0];
  for (const container of group.containers) {
    const a = container.massG ?? -1;
    const b = best.massG ?? -1;
    if (a > b || (a === b && (container.volumeL ?? -1) > (best.volumeL ?? -1))) best = container;
  }
  return best;
}

export function largestByVolume(group: ContentGroup): MeasuredContainer {
  let best = group.containers[0];
  for (const container of group.containers) {
    if ((container.volumeL ?? -1) > (best.volumeL ?? -1)) best = container;
  }
  return best;
}

// ---------------------------------------------------------------------------------------------
// The context
// ---------------------------------------------------------------------------------------------

type MissingInput = {
  kind: MissingDataKind;
  subject: FindingSubject;
  /** Name of what lacks the data, e.g. "diethyl ether" or "room 2.115". */
  subjectName: string;
  scenario: Scenario;
  /** What is missing, in words: "no LFL". */
  what: string;
  /** What the assessment did instead, in words. */
  consequence: string;
  substanceId?: number | null;
  mixtureId?: number | null;
  containerIds?: number[];
  inputs?: TraceValue[];
};

export class AssessmentContext {
  readonly settings: AssessmentSettings;
  readonly cache: AssessmentCache;
  readonly snapshot: LocationSnapshot;
  readonly room: RoomInfo;
  readonly unit: UnitInfo | null;
  readonly location: LocationRef;
  /** "FSR-1" for a unit, "room 2.115" for a room. */
  readonly label: string;
  readonly pressureKPa: number;
  readonly groups: ContentGroup[];
  /** The scenario that temperature-independent findings (quantities, ignition, missing data) are filed under. */
  readonly primaryScenario: Scenario;
  private readonly findings = new Map<string, CandidateFinding>();
  private readonly missingSeen = new Set<string>();

  constructor(snapshot: LocationSnapshot, settings: AssessmentSettings, cache: AssessmentCache) {
    this.snapshot = snapshot;
    this.settings = settings;
    this.cache = cache;
    this.room = snapshot.room;
    this.unit = snapshot.kind === "unit" ? snapshot.unit : null;
    this.location = snapshot.kind === "unit" ? { kind: "unit", id: snapshot.unit.id } : { kind: "room", id: snapshot.room.id };
    this.label = snapshot.kind === "unit" ? snapshot.unit.code : `room ${snapshot.room.code}`;
    this.pressureKPa = snapshot.room.atmosphericPressureKPa;
    this.primaryScenario = snapshot.kind === "unit" ? "in_control" : "room_worst_case";
    this.groups = this.groupContents(snapshot.contents);
  }

  private groupContents(contents: readonly StoredLiquid[]): ContentGroup[] {
    const groups = new Map<string, ContentGroup>();
    for (const liquid of contents) {
      if (liquid.state === "empty" || liquid.state === "disposed" || !(liquid.amount > 0)) continue;
      const content = liquid.content;
      const key = content.kind === "substance" ? `substance:${content.substance.id}` : `mixture:${content.mixture.id}`;
      let group = groups.get(key);
      if (group === undefined) {
        group = {
          key,
          content,
          name: contentName(content),
          subject: content.kind === "substance" ? { kind: "substance", id: content.substance.id } : { kind: "mixture", id: content.mixture.id },
          substanceId: content.kind === "substance" ? content.substance.id : null,
          mixtureId: content.kind === "mixture" ? content.mixture.id : null,
          physicalState: content.kind === "substance" ? content.substance.physicalState : "liquid",
          containers: [],
          vaporMemo: [],
        };
        groups.set(key, group);
      }
      const measured = measure(liquid);
      group.containers.push(measured);
      if (group.physicalState === "liquid" && (measured.massG === null || measured.volumeL === null)) {
        this.missing({
          kind: "no-density",
          subject: group.subject,
          subjectName: group.name,
          scenario: this.primaryScenario,
          what: `no liquid density, so ${liquid.amount} ${liquid.amountUnit} in ${liquid.label} cannot be turned into ${measured.massG === null ? "a mass" : "a volume"}`,
          consequence:
            measured.massG === null
              ? "the enclosure bound uses the saturated concentration alone and no spill is modelled for this container"
              : "the container is left out of the quantity totals",
          substanceId: group.substanceId,
          mixtureId: group.mixtureId,
          containerIds: [liquid.containerId],
        });
      }
    }
    return [...groups.values()];
  }

  /** Liquid groups only (cryogens, dry ice and gases are assessed by their own rules). */
  liquidGroups(): ContentGroup[] {
    return this.groups.filter((group) => group.physicalState === "liquid");
  }

  saturation(substance: SubstanceSnapshot, tempC: number): SaturationEntry {
    return cachedSaturation(this.cache, substance, tempC, this.pressureKPa);
  }

  /**
   * Whether the substance's vapor pressure can be computed; reports the gap (no correlation: a
   * Clausius–Clapeyron estimate stands in; no correlation and no boiling point: nothing can).
   */
  vaporPressureAvailable(substance: SubstanceSnapshot, scenario: Scenario, group: ContentGroup): boolean {
    if (substance.hasCorrelation) return true;
    const canEstimate = substance.normalBoilingPointC !== null;
    this.missing({
      kind: canEstimate ? "no-correlation" : "no-vapor-pressure-method",
      subject: { kind: "substance", id: substance.id },
      subjectName: substance.name,
      scenario,
      what: canEstimate ? "no vapor-pressure correlation (Antoine or DIPPR-101)" : "no vapor-pressure correlation and no normal boiling point",
      consequence: canEstimate
        ? "the vapor pressure is estimated by the integrated Clausius–Clapeyron equation from the normal boiling point, which grows less certain away from it"
        : "its vapor concentration, boiling and spill cannot be assessed",
      substanceId: substance.id,
      containerIds: group.containers.map((c) => c.liquid.containerId),
    });
    return canEstimate;
  }

  /** Records an engine error for a substance as missing data. */
  calculationFailed(substance: SubstanceSnapshot, scenario: Scenario, group: ContentGroup, message: string): void {
    this.missing({
      kind: "calculation-failed",
      subject: { kind: "substance", id: substance.id },
      subjectName: substance.name,
      scenario,
      what: `a calculation failed: ${message}`,
      consequence: "the rules that need this value were not applied to it",
      substanceId: substance.id,
      containerIds: group.containers.map((c) => c.liquid.containerId),
    });
  }

  /** Adds a finding; a second finding with the same fingerprint keeps the worse of the two. */
  add(finding: CandidateFinding): void {
    const existing = this.findings.get(finding.fingerprint);
    if (existing === undefined || severityOrder(finding.severity) > severityOrder(existing.severity)) this.findings.set(finding.fingerprint, finding);
  }

  /** A missing-data finding (once per kind and subject in this location, under the first scenario that needed it). */
  missing(input: MissingInput): void {
    const key = `${input.kind}|${subjectKey(input.subject)}`;
    if (this.missingSeen.has(key)) return;
    this.missingSeen.add(key);
    const severity = this.settings.missingData.severities[input.kind];
    const label = this.label;
    const source = this.settings.missingData.source;
    this.finding({
      rule: "missing-data",
      severity,
      scenario: input.scenario,
      subject: input.subject,
      detail: input.kind,
      title: input.subjectName === this.label ? `Missing data: ${this.label} has ${input.what}` : `Missing data: ${input.subjectName} in ${this.label} has ${input.what}`,
      containerId: input.containerIds?.length === 1 ? input.containerIds[0] : null,
      substanceId: input.substanceId ?? null,
      mixtureId: input.mixtureId ?? null,
      value: null,
      limitValue: null,
      ratio: null,
      unit: null,
      view: null,
      containerIds: input.containerIds ?? [],
      trace: () => ({
        rule: "missing-data",
        scenario: input.scenario,
        method: "Missing data",
        source,
        inputs: [traceValue("Location", "location", label, ""), traceValue("Data missing", "missing", input.what, ""), ...(input.inputs ?? [])],
        steps: [
          traceStep(
            "What the assessment did instead",
            "—",
            input.consequence,
            traceValue("Severity (missing data)", "severity", severity, "", `settings: missing data "${input.kind}"`),
          ),
        ],
        result: traceValue("Missing", "missing", input.what, ""),
        warnings: [],
        parts: [],
      }),
    });
  }

  /**
   * A finding in the common shape. `trace` is a builder: the trace is built on first read of
   * `finding.trace`, so a re-assessment that finds a finding unchanged need not pay for it.
   */
  finding(input: {
    rule: RuleId;
    severity: Severity;
    scenario: Scenario;
    subject: FindingSubject;
    detail?: string;
    title: string;
    containerId?: number | null;
    substanceId?: number | null;
    mixtureId?: number | null;
    value: number | null;
    limitValue: number | null;
    ratio: number | null;
    unit: string | null;
    view: ScenarioView | null;
    trace: () => FindingTrace;
    containerIds: number[];
  }): void {
    const build = input.trace;
    const ids = input.containerIds;
    this.add(
      new Finding(
        findingFingerprint({ rule: input.rule, location: this.location, subject: input.subject, scenario: input.scenario, detail: input.detail }),
        input.rule,
        input.severity,
        input.scenario,
        input.title,
        this.room.siteId,
        this.room.id,
        this.unit?.id ?? null,
        input.containerId ?? null,
        input.substanceId ?? null,
        input.mixtureId ?? null,
        input.value,
        input.limitValue,
        input.ratio,
        input.unit,
        input.view?.tempC ?? null,
        input.view?.source ?? null,
        input.containerIds,
        () => ({ ...build(), containers: this.traceContainers(ids) }),
      ),
    );
  }

  private containerMemo: Map<number, TraceContainer> | null = null;

  /** The containers of these ids as the rules read them, in the order given. */
  traceContainers(ids: readonly number[]): TraceContainer[] {
    if (this.containerMemo === null) {
      this.containerMemo = new Map();
      for (const group of this.groups) {
        for (const measured of group.containers) {
          const { liquid } = measured;
          this.containerMemo.set(liquid.containerId, {
            containerId: liquid.containerId,
            label: liquid.label,
            content: group.name,
            substanceId: group.substanceId,
            mixtureId: group.mixtureId,
            amount: liquid.amount,
            amountUnit: liquid.amountUnit,
            state: liquid.state,
            volumeL: measured.volumeL,
            massG: measured.massG,
          });
        }
      }
    }
    const memo = this.containerMemo;
    return [...new Set(ids)].flatMap((id) => {
      const found = memo.get(id);
      return found ? [found] : [];
    });
  }

  results(): CandidateFinding[] {
    return [...this.findings.values()];
  }

  /** Forgets the findings collected so far: the same location's rules can then run again at another temperature (time-to-danger.ts). */
  clearFindings(): void {
    this.findings.clear();
    this.missingSeen.clear();
  }
}

/**
 * A proposed finding. Its data are own properties; `trace` is a memoised getter on the prototype,
 * so the trace is built only when it is read. `toJSON()` (and so JSON.stringify) includes it;
 * copy a finding with `toPlain()`, not with a spread (a spread leaves the getter behind).
 */
export class Finding implements CandidateFinding {
  private traceCache: FindingTrace | null = null;
  /** Set after the rules by the time-to-danger pass (time-to-danger.ts). */
  timeToDanger: TimeToDanger | null = null;
  /** Control-lost findings: every severity threshold on the way up, with its temperature (time-to-danger.ts; not stored). */
  thresholdTemps: readonly { severity: Severity; threshold: string; tempC: number }[] | null = null;
  private timeToDangerTrace: (() => { steps: TraceStep[]; inputs: TraceValue[]; warnings: string[]; parts?: Trace[]; crossings?: FindingTrace["crossings"] }) | null = null;
  constructor(
    readonly fingerprint: string,
    readonly rule: RuleId,
    readonly severity: Severity,
    readonly scenario: Scenario,
    readonly title: string,
    readonly siteId: number,
    readonly roomId: number,
    readonly storageUnitId: number | null,
    readonly containerId: number | null,
    readonly substanceId: number | null,
    readonly mixtureId: number | null,
    readonly value: number | null,
    readonly limitValue: number | null,
    readonly ratio: number | null,
    readonly unit: string | null,
    readonly worstCaseTempC: number | null,
    readonly worstCaseSource: string | null,
    readonly containerIds: number[],
    private readonly buildTrace: () => FindingTrace,
  ) {}

  get trace(): FindingTrace {
    this.traceCache ??= this.withTimeToDanger(this.safeTrace());
    return this.traceCache;
  }

  /** Records when after a failure this finding's severity is reached, with the trace steps that show it. */
  setTimeToDanger(value: TimeToDanger | null, trace: () => { steps: TraceStep[]; inputs: TraceValue[]; warnings: string[]; parts?: Trace[]; crossings?: FindingTrace["crossings"] }): void {
    this.timeToDanger = value;
    this.timeToDangerTrace = trace;
    this.traceCache = null;
  }

  private withTimeToDanger(trace: FindingTrace): FindingTrace {
    if (this.timeToDangerTrace === null) return trace;
    const extra = this.timeToDangerTrace();
    return {
      ...trace,
      inputs: [...trace.inputs, ...extra.inputs],
      steps: [...trace.steps, ...extra.steps],
      warnings: [...trace.warnings, ...extra.warnings],
      parts: [...trace.parts, ...(extra.parts ?? [])],
      ...(extra.crossings ? { crossings: extra.crossings } : {}),
    };
  }

  /** The engine re-checks its inputs while tracing; should it refuse one, the finding keeps a trace saying why. */
  private safeTrace(): FindingTrace {
    try {
      return this.buildTrace();
    } catch (error) {
      if (!(error instanceof HazardInputError)) throw error;
      return {
        rule: this.rule,
        scenario: this.scenario,
        method: this.rule,
        source: "—",
        inputs: [],
        steps: [traceStep("The calculation could not be traced", "—", error.message, traceValue("Value", "value", this.value ?? "—", this.unit ?? ""))],
        result: traceValue("Value", "value", this.value ?? "—", this.unit ?? ""),
        warnings: [`The engine refused an input while tracing (${error.field}): ${error.message}`],
        parts: [],
      };
    }
  }

  toPlain(): PlainCandidateFinding {
    return {
      fingerprint: this.fingerprint,
      rule: this.rule,
      severity: this.severity,
      scenario: this.scenario,
      title: this.title,
      siteId: this.siteId,
      roomId: this.roomId,
      storageUnitId: this.storageUnitId,
      containerId: this.containerId,
      substanceId: this.substanceId,
      mixtureId: this.mixtureId,
      value: this.value,
      limitValue: this.limitValue,
      ratio: this.ratio,
      unit: this.unit,
      worstCaseTempC: this.worstCaseTempC,
      worstCaseSource: this.worstCaseSource,
      timeToDanger: this.timeToDanger,
      trace: this.trace,
      containerIds: this.containerIds,
    };
  }

  toJSON(): PlainCandidateFinding {
    return this.toPlain();
  }
}

function severityOrder(severity: Severity): number {
  return severity === "critical" ? 4 : severity === "high" ? 3 : severity === "moderate" ? 2 : 1;
}

// ---------------------------------------------------------------------------------------------
// Traces
// ---------------------------------------------------------------------------------------------

export function worstCaseInput(view: ScenarioView): TraceValue {
  return traceValue("Worst-case temperature", "T", view.tempC, "°C", view.source);
}

/** The finding's trace: the rule's own inputs and steps on top, the engine's traces unchanged in parts. */
export function findingTrace(input: {
  rule: RuleId;
  scenario: Scenario;
  method: string;
  source: string;
  inputs: TraceValue[];
  steps: TraceStep[];
  result: TraceValue;
  parts: Trace[];
  warnings?: string[];
}): FindingTrace {
  const warnings: string[] = [];
  const seen = new Set<string>();
  for (const warning of [...input.parts.flatMap((part) => part.warnings), ...(input.warnings ?? [])]) {
    if (!seen.has(warning)) {
      seen.add(warning);
      warnings.push(warning);
    }
  }
  return {
    rule: input.rule,
    scenario: input.scenario,
    method: input.method,
    source: input.source,
    inputs: input.inputs,
    steps: input.steps,
    result: input.result,
    warnings,
    parts: input.parts,
  };
}

/** The step that names the thresholds and the severity they give. */
export function severityStep(description: string, rule: string, substituted: string, severity: Severity, source: string): TraceStep {
  return traceStep(description, rule, substituted, traceValue("Severity", "severity", severity, "", source));
}
