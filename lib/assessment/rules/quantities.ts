/**
 * quantity-limit: litres of liquid by NFPA 30 class in a room, in each flammable-liquid cabinet
 * and in each unit, against the organisation's configured limits (sprinklered allowances where
 * the room is sprinklered). The limits are settings, never constants: codes differ by edition,
 * jurisdiction, occupancy and floor.
 */
import type { LiquidClass } from "@/db/enums";
import { rollUpQuantities, traceValue, type NfpaLiquidClass, type QuantityItem } from "@/lib/hazard";
import { findingTrace, severityStep, type AssessmentContext, type ContentGroup } from "./context";
import { formatQuantity, formatSig, formatSignificant } from "./format";
import { ruleLabel } from "./rule-ids";
import { quantitySeverity } from "./severity";
import type { QuantityLimitSetting } from "./types";

function classOf(group: ContentGroup): { nfpaClass: NfpaLiquidClass | null; flashPointC: number | null; boilingPointC: number | null } {
  if (group.content.kind === "substance") {
    const s = group.content.substance;
    return { nfpaClass: s.nfpaClass, flashPointC: s.flashPointC, boilingPointC: s.normalBoilingPointC };
  }
  const m = group.content.mixture;
  return { nfpaClass: m.nfpaClass, flashPointC: m.flashPointC, boilingPointC: m.boilingPointC };
}

function classesText(classes: readonly LiquidClass[]): string {
  return `Class ${classes.join(", ")}`;
}

export function quantityRule(ctx: AssessmentContext): void {
  const scopes: QuantityLimitSetting["scope"][] = ctx.unit ? ["storage_unit", ...(ctx.unit.kind === "flammable_cabinet" ? (["flammable_cabinet"] as const) : [])] : ["room"];
  const limits = ctx.settings.quantities.limits.filter((limit) => scopes.includes(limit.scope));
  if (limits.length === 0) return;
  const sprinklered = ctx.room.sprinklered;
  const totals = new Map<NfpaLiquidClass, number>();
  const idsByClass = new Map<NfpaLiquidClass, number[]>();
  const groups = ctx.liquidGroups();
  for (const group of groups) {
    const { nfpaClass, flashPointC } = classOf(group);
    if (flashPointC === null && group.content.kind === "substance" && group.content.substance.lflVolPercent !== null) {
      ctx.missing({
        kind: "no-flash-point",
        subject: group.subject,
        subjectName: group.name,
        scenario: ctx.primaryScenario,
        what: "an LFL but no flash point",
        consequence: "it cannot be classed (GHS category, NFPA class): the flash-point, ignition-source and quantity rules leave it out",
        substanceId: group.substanceId,
        containerIds: group.containers.map((c) => c.liquid.containerId),
      });
    }
    if (nfpaClass === null) continue;
    let total = totals.get(nfpaClass) ?? 0;
    let ids = idsByClass.get(nfpaClass);
    if (ids === undefined) {
      ids = [];
      idsByClass.set(nfpaClass, ids);
    }
    for (const container of group.containers) {
      if (container.volumeL === null) continue;
      total += container.volumeL;
      ids.push(container.liquid.containerId);
    }
    totals.set(nfpaClass, total);
  }
  const maxOf = (limit: QuantityLimitSetting) => (sprinklered && limit.sprinkleredMaxVolumeL !== null ? limit.sprinkleredMaxVolumeL : limit.maxVolumeL);
  const checks = limits.flatMap((limit) => {
    const totalL = limit.liquidClasses.reduce((sum, liquidClass) => sum + (totals.get(liquidClass) ?? 0), 0);
    const maxVolumeL = maxOf(limit);
    const ratio = totalL / maxVolumeL;
    const severity = quantitySeverity(ratio, ctx.settings);
    return severity === null ? [] : [{ limit, totalL, maxVolumeL, ratio, severity }];
  });
  if (checks.length === 0) return;

  // One roll-up by the engine for every limit raised here, built when a trace is first read.
  let rollUp: ReturnType<typeof rollUpQuantities> | null = null;
  const engineRollUp = () => {
    if (rollUp === null) {
      const items: QuantityItem[] = [];
      for (const group of groups) {
        const { flashPointC, boilingPointC } = classOf(group);
        for (const container of group.containers) {
          if (container.volumeL === null) continue;
          items.push({
            label: `${container.liquid.label} (${group.name})`,
            volumeL: container.volumeL,
            ...(flashPointC !== null && boilingPointC !== null ? { flashPointC, boilingPointC } : {}),
          });
        }
      }
      rollUp = rollUpQuantities({
        items,
        limits: checks.map((check) => ({ name: check.limit.name, maxVolumeL: check.maxVolumeL, nfpaClasses: [...check.limit.liquidClasses], source: check.limit.basis })),
      });
    }
    return rollUp;
  };
  const { quantities } = ctx.settings;
  for (const check of checks) {
    const { limit, totalL, maxVolumeL, ratio, severity } = check;
    const over = ratio > 1;
    const usesSprinklered = sprinklered && limit.sprinkleredMaxVolumeL !== null;
    ctx.finding({
      rule: "quantity-limit",
      severity,
      scenario: ctx.primaryScenario,
      subject: { kind: "quantity-limit", id: limit.id },
      title: over
        ? `${classesText(limit.liquidClasses)} liquids in ${ctx.label} total ${formatQuantity(totalL, "L")}, over the limit of ${formatQuantity(maxVolumeL, "L")} (${limit.name})`
        : `${classesText(limit.liquidClasses)} liquids in ${ctx.label} total ${formatQuantity(totalL, "L")}, ${formatSignificant(ratio * 100)} % of the limit of ${formatQuantity(maxVolumeL, "L")} (${limit.name})`,
      value: totalL,
      limitValue: maxVolumeL,
      ratio,
      unit: "L",
      view: null,
      containerIds: limit.liquidClasses.flatMap((liquidClass) => idsByClass.get(liquidClass) ?? []),
      trace: () =>
        findingTrace({
          rule: "quantity-limit",
          scenario: ctx.primaryScenario,
          method: `${ruleLabel("quantity-limit")}: ${limit.name}`,
          source: limit.basis,
          inputs: [
            traceValue("Location", "location", ctx.label, ""),
            traceValue("Limit", "L_max", maxVolumeL, "L", usesSprinklered ? `${limit.basis} (sprinklered allowance)` : limit.basis),
            traceValue("Liquid classes counted", "classes", limit.liquidClasses.join(", "), ""),
            traceValue("Room sprinklered", "sprinklered", sprinklered, ""),
            ...(quantities.warnFraction !== null ? [traceValue("Warning fraction", "f_warn", quantities.warnFraction, "", "settings: quantity warning (its source is on the severity step)")] : []),
          ],
          steps: [
            severityStep(
              "Severity: over the limit (above 100 %), or at or above the warning fraction",
              `V/L_max > 1 → ${quantities.exceededSeverity}${quantities.warnFraction !== null ? `; ≥ ${quantities.warnFraction} → ${quantities.warnSeverity}` : ""}`,
              `V/L_max = ${formatSig(totalL, 5)}/${formatSig(maxVolumeL, 5)} = ${formatSig(ratio, 4)} → ${severity}`,
              severity,
              quantities.source,
            ),
          ],
          result: traceValue("Total of the classes counted", "V", totalL, "L"),
          parts: [engineRollUp().trace],
          warnings: [],
        }),
    });
  }
}
