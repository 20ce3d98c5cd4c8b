/**
 * oxygen-depletion and co2-exposure, for a room: the whole cryogen inventory boils off and all
 * dry ice sublimes at once with no ventilation (the worst case BCGA GN11 recommends for risk
 * assessment). The gas displaces room air, O₂ = O₂,air × (1 − V_gas/V_room) (Univ. of Oxford
 * Safety Office S4/03 App. 1), and the CO₂ is compared with its exposure limits: it is toxic long
 * before it is an asphyxiant.
 */
import {
  CARBON_DIOXIDE_MOLAR_MASS_G_PER_MOL,
  dryIceRelease,
  molarVolumeLPerMol,
  oxygenAfterRelease,
  traceStep,
  traceValue,
  type ExposureLimit,
  type Trace,
  type TraceStep,
  type TraceValue,
} from "@/lib/hazard";
import type { Severity } from "@/db/enums";
import { findingTrace, severityStep, type AssessmentContext, type ContentGroup, type ScenarioView } from "./context";
import { formatQuantity, formatSig, formatSignificant } from "./format";
import { ruleLabel } from "./rule-ids";
import { exposureSeverity, oxygenSeverity, severityRank } from "./severity";

const CARBON_DIOXIDE_CAS = "124-38-9";

function isDryIce(group: ContentGroup): boolean {
  return group.content.kind === "substance" && group.physicalState === "solid" && group.content.substance.cas === CARBON_DIOXIDE_CAS;
}

type GasRelease = { label: string; gasVolumeM3: number; step: TraceStep; containerIds: number[] };

/** Gas volume of each cryogen group: n = m/M (from the mass, or the liquid volume × density), V = n·Vm(T_ref). */
function cryogenReleases(ctx: AssessmentContext, referenceTempC: number): GasRelease[] {
  const molarVolumeL = molarVolumeLPerMol(referenceTempC, ctx.pressureKPa);
  const releases: GasRelease[] = [];
  for (const group of ctx.groups) {
    if (group.physicalState !== "cryogen" || group.content.kind !== "substance") continue;
    const substance = group.content.substance;
    let massG = 0;
    let unknown = 0;
    for (const container of group.containers) {
      if (container.massG === null) unknown += 1;
      else massG += container.massG;
    }
    if (unknown > 0) {
      ctx.missing({
        kind: "no-expansion-data",
        subject: group.subject,
        subjectName: group.name,
        scenario: "room_worst_case",
        what: "no liquid density, so its volume cannot be turned into a gas volume",
        consequence: `${unknown} container${unknown === 1 ? "" : "s"} of it ${unknown === 1 ? "is" : "are"} left out of the oxygen calculation`,
        substanceId: substance.id,
        containerIds: group.containers.filter((c) => c.massG === null).map((c) => c.liquid.containerId),
      });
    }
    if (!(massG > 0)) continue;
    const gasVolumeM3 = ((massG / substance.molarMassGPerMol) * molarVolumeL) / 1000;
    releases.push({
      label: group.name,
      gasVolumeM3,
      containerIds: group.containers.filter((c) => c.massG !== null).map((c) => c.liquid.containerId),
      step: traceStep(
        `Gas from all the ${group.name} (${group.containers.length} container${group.containers.length === 1 ? "" : "s"})`,
        "V_gas = (m/M)·Vm(T_ref); m = V_liquid × ρ",
        `V_gas = (${formatSig(massG, 5)} g / ${substance.molarMassGPerMol} g/mol) × ${formatSig(molarVolumeL, 5)} L/mol = ${formatSig(gasVolumeM3, 5)} m³`,
        traceValue(`Gas volume of ${group.name}`, "V_gas", gasVolumeM3, "m³"),
      ),
    });
  }
  return releases;
}

function limitsOf(ctx: AssessmentContext): ExposureLimit[] {
  return ctx.settings.carbonDioxide.limits.map((limit) => ({ kind: limit.kind, value: limit.valuePpm, unit: "ppm", body: limit.body, source: limit.source }));
}

export function cryogenRules(ctx: AssessmentContext, view: ScenarioView | null): void {
  const dryIce = ctx.groups.filter(isDryIce);
  const hasCryogens = ctx.groups.some((group) => group.physicalState === "cryogen");
  if (dryIce.length === 0 && !hasCryogens) return;
  const roomVolumeM3 = ctx.room.volumeM3;
  if (roomVolumeM3 === null || !(roomVolumeM3 > 0)) {
    ctx.missing({
      kind: "no-room-volume",
      subject: { kind: "location", key: "room-volume" },
      subjectName: `room ${ctx.room.code}`,
      scenario: "room_worst_case",
      what: "no volume (floor area and height)",
      consequence: "the oxygen and CO₂ after a release of its cryogens and dry ice cannot be computed",
    });
    return;
  }
  const { oxygen } = ctx.settings;
  const tempC = view?.tempC ?? oxygen.expansionReferenceTempC;
  const tempSource = view ? view.source : `reference temperature ${oxygen.expansionReferenceTempC} °C (no worst case known)`;
  // Gas volumes at the warmer of the reference and the worst-case temperature (more gas).
  const gasTempC = Math.max(tempC, oxygen.expansionReferenceTempC);
  const releases = cryogenReleases(ctx, gasTempC);

  let dryIceMassKg = 0;
  const dryIceIds: number[] = [];
  for (const group of dryIce) {
    for (const container of group.containers) {
      if (container.massG === null) {
        ctx.missing({
          kind: "no-density",
          subject: group.subject,
          subjectName: group.name,
          scenario: "room_worst_case",
          what: `an amount in ${container.liquid.amountUnit} without a density (${container.liquid.label})`,
          consequence: "that container is left out of the CO₂ and oxygen calculation",
          substanceId: group.substanceId,
          containerIds: [container.liquid.containerId],
        });
        continue;
      }
      dryIceMassKg += container.massG / 1000;
      dryIceIds.push(container.liquid.containerId);
    }
  }
  let dryIceTrace: Trace | null = null;
  let dryIceGasM3 = 0;
  if (dryIceMassKg > 0) {
    const release = dryIceRelease({
      massKg: dryIceMassKg,
      roomVolumeM3,
      tempC: gasTempC,
      ambientPressureKPa: ctx.pressureKPa,
      limits: limitsOf(ctx),
      baselineOxygenPercent: oxygen.baselinePercent,
      deficiencyThresholdPercent: oxygen.deficiencyPercent,
    });
    dryIceTrace = release.trace;
    dryIceGasM3 = release.gasVolumeM3;
    carbonDioxideFinding(ctx, release, dryIceMassKg, dryIceIds, view, gasTempC, tempSource);
  }

  const totalGasM3 = releases.reduce((sum, r) => sum + r.gasVolumeM3, 0) + dryIceGasM3;
  if (!(totalGasM3 > 0)) return;
  const o2 = oxygenAfterRelease({ gasVolumeM3: totalGasM3, roomVolumeM3, baselineOxygenPercent: oxygen.baselinePercent, deficiencyThresholdPercent: oxygen.deficiencyPercent });
  const severity = oxygenSeverity(o2.oxygenPercent, ctx.settings);
  if (severity === null) return;
  const steps: TraceStep[] = [
    ...releases.map((r) => r.step),
    ...(dryIceMassKg > 0
      ? [
          traceStep(
            "Gas from all the dry ice",
            "V_CO₂ = (m/M)·Vm(T)",
            `V_CO₂ = ${formatSig(dryIceGasM3, 5)} m³ (see the dry-ice part)`,
            traceValue("Gas volume of CO₂", "V_CO₂", dryIceGasM3, "m³"),
          ),
        ]
      : []),
    traceStep(
      "All released gas together",
      "V_gas = Σ V_gas,i",
      `V_gas = ${formatSig(totalGasM3, 5)} m³`,
      traceValue("Released gas volume", "V_gas", totalGasM3, "m³"),
    ),
    severityStep(
      "Severity: below the evacuation level, or below the deficiency level (strictly below)",
      `O₂ < ${oxygen.evacuatePercent} % → ${oxygen.evacuateSeverity}; O₂ < ${oxygen.deficiencyPercent} % → ${oxygen.deficiencySeverity}`,
      `O₂ = ${formatSig(o2.oxygenPercent, 4)} % → ${severity}`,
      severity,
      oxygen.source,
    ),
  ];
  const limit = severity === oxygen.evacuateSeverity && o2.oxygenPercent < oxygen.evacuatePercent ? oxygen.evacuatePercent : oxygen.deficiencyPercent;
  const inputs: TraceValue[] = [
    traceValue("Room volume", "V_room", roomVolumeM3, "m³"),
    traceValue("Gas temperature", "T", gasTempC, "°C", tempSource),
    traceValue("Oxygen-deficiency threshold", "O₂,min", oxygen.deficiencyPercent, "%", "settings: oxygen thresholds (their source is the trace's source)"),
    traceValue("Evacuation threshold", "O₂,evac", oxygen.evacuatePercent, "%", "settings: oxygen thresholds (their source is the trace's source)"),
  ];
  ctx.finding({
    rule: "oxygen-depletion",
    severity,
    scenario: "room_worst_case",
    subject: { kind: "location", key: "cryogen-inventory" },
    title: `Oxygen in ${ctx.label} could fall to ${formatSignificant(o2.oxygenPercent)} % if its ${[releases.length > 0 ? "cryogens" : null, dryIceMassKg > 0 ? "dry ice" : null].filter(Boolean).join(" and ")} were all released${
      o2.exceedsRoomVolume ? `: ${formatSignificant(totalGasM3)} m³ of gas, ${formatSig(totalGasM3 / roomVolumeM3, 2)} times the room's volume` : ""
    } (room worst case)`,
    value: o2.oxygenPercent,
    limitValue: limit,
    ratio: limit / o2.oxygenPercent,
    unit: "% O₂",
    view,
    containerIds: [...releases.flatMap((r) => r.containerIds), ...dryIceIds],
    trace: () =>
      findingTrace({
        rule: "oxygen-depletion",
        scenario: "room_worst_case",
        method: ruleLabel("oxygen-depletion"),
        source: oxygen.source,
        inputs,
        steps,
        result: traceValue("Oxygen after the release", "O₂", o2.oxygenPercent, "%"),
        parts: [...(dryIceTrace ? [dryIceTrace] : []), o2.trace],
        warnings: ["Ventilation is not counted: the release is taken as instant (the worst case)"],
      }),
  });
}

function carbonDioxideFinding(
  ctx: AssessmentContext,
  release: ReturnType<typeof dryIceRelease>,
  massKg: number,
  containerIds: number[],
  view: ScenarioView | null,
  gasTempC: number,
  tempSource: string,
): void {
  let worst: { ratio: number; severity: Severity; limit: ExposureLimit } | null = null;
  for (const item of release.limitRatios) {
    const severity = exposureSeverity(item.limit.kind, item.ratio, ctx.settings);
    if (severity === null) continue;
    if (worst === null || severityRank(severity) > severityRank(worst.severity) || (severity === worst.severity && item.ratio > worst.ratio)) {
      worst = { ratio: item.ratio, severity, limit: item.limit };
    }
  }
  if (worst === null) return;
  const { exposure } = ctx.settings;
  const label = `${worst.limit.body ? `${worst.limit.body} ` : ""}${worst.limit.kind}`;
  ctx.finding({
    rule: "co2-exposure",
    severity: worst.severity,
    scenario: "room_worst_case",
    subject: { kind: "location", key: "dry-ice" },
    title: `${formatQuantity(massKg, "kg")} of dry ice in ${ctx.label} could raise CO₂ to ${formatSignificant(release.carbonDioxidePpm)} ppm, ${formatSignificant(worst.ratio * 100)} % of the ${label}, if it all sublimes`,
    value: release.carbonDioxidePpm,
    limitValue: worst.limit.value,
    ratio: worst.ratio,
    unit: "ppm",
    view,
    containerIds,
    trace: () =>
      findingTrace({
        rule: "co2-exposure",
        scenario: "room_worst_case",
        method: ruleLabel("co2-exposure"),
        source: ctx.settings.carbonDioxide.source,
        inputs: [
          traceValue("Dry ice", "m", massKg, "kg"),
          traceValue("Molar mass of CO₂", "M", CARBON_DIOXIDE_MOLAR_MASS_G_PER_MOL, "g/mol", "CIAAW atomic weights"),
          traceValue("Gas temperature", "T", gasTempC, "°C", tempSource),
          ...ctx.settings.carbonDioxide.limits.map((limit) => traceValue(`CO₂ ${limit.body} ${limit.kind}`, `L_${limit.kind}`, limit.valuePpm, "ppm", limit.source)),
        ],
        steps: [
          severityStep(
            "Severity: the worst limit exceeded (above 1), or the TWA action level",
            `IDLH > 1 → ${exposure.idlhSeverity}; STEL > 1 → ${exposure.stelSeverity}; ceiling > 1 → ${exposure.ceilingSeverity}; TWA > 1 → ${exposure.twaSeverity}${exposure.twaActionFraction !== null ? `; TWA ≥ ${exposure.twaActionFraction} → ${exposure.actionSeverity}` : ""}`,
            `${label}: r = ${formatSig(release.carbonDioxidePpm, 5)}/${formatSig(worst.limit.value, 5)} = ${formatSig(worst.ratio, 4)} → ${worst.severity}`,
            worst.severity,
            exposure.source,
          ),
        ],
        result: traceValue("CO₂ after full sublimation", "C_CO₂", release.carbonDioxidePpm, "ppm"),
        parts: [release.trace],
        warnings: [],
      }),
  });
}
