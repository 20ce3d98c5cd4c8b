/**
 * The scenarios of a location with their worst-case temperatures: a room at its worst case (and
 * a spill there); a temperature-controlled unit in control (its set range and its readings outside
 * its excursions) and with control lost (the higher of its room's worst case and its highest
 * excursion peak: an excursion is the unit out of control, so it is assessed here and only here);
 * a unit without control at its own worst case, or its room's when it has none.
 */
import type { WorstCase } from "@/lib/temperatures/worst-case";
import { isTemperatureControlled, unitNoun, type AssessmentContext, type ScenarioView } from "./context";
import { formatTempC } from "./format";

function missingWorstCase(ctx: AssessmentContext, scenario: ScenarioView["scenario"], what: string): void {
  ctx.missing({
    kind: "no-worst-case",
    subject: { kind: "location", key: `worst-case-${scenario}` },
    subjectName: ctx.unit ? ctx.unit.code : `room ${ctx.room.code}`,
    scenario,
    what,
    consequence: "the temperature-dependent rules (vapor, flash point, boiling point, spill) were not applied under this scenario",
  });
}

export function unitScenarios(ctx: AssessmentContext): ScenarioView[] {
  const unit = ctx.unit;
  if (unit === null) return [];
  const room = ctx.room;
  const views: ScenarioView[] = [];
  const controlled = isTemperatureControlled(unit);
  let inControl: { tempC: number; source: string } | null = null;
  if (unit.worstCase.inControl) {
    inControl = { tempC: unit.worstCase.inControl.tempC, source: unit.worstCase.inControl.description };
  } else if (!controlled && room.worstCase) {
    inControl = { tempC: room.worstCase.tempC, source: `${room.worstCase.description} (the room's worst case; the unit has none of its own)` };
  }
  if (inControl) {
    views.push({
      scenario: "in_control",
      tempC: inControl.tempC,
      source: inControl.source,
      phrase: controlled ? `at its worst case in control (${formatTempC(inControl.tempC)})` : `at its worst case (${formatTempC(inControl.tempC)})`,
    });
  } else {
    missingWorstCase(
      ctx,
      "in_control",
      controlled
        ? "no worst-case temperature (no set range, design maximum, readings or excursions)"
        : "no worst-case temperature of its own or of its room (no design maximum, readings or excursions)",
    );
  }
  if (controlled) {
    let lost: { tempC: number; source: string } | null = unit.worstCase.controlLost
      ? { tempC: unit.worstCase.controlLost.tempC, source: unit.worstCase.controlLost.description }
      : room.worstCase
        ? { tempC: room.worstCase.tempC, source: `${room.worstCase.description} (the room's worst case, as if the unit had failed)` }
        : null;
    // Never below the unit's own worst case (as controlLostWorstCase does).
    if (lost && inControl && inControl.tempC > lost.tempC) lost = inControl;
    if (lost) {
      views.push({
        scenario: "control_lost",
        tempC: lost.tempC,
        source: lost.source,
        phrase: `if the ${unitNoun(unit.kind)} fails (control lost, ${formatTempC(lost.tempC)})`,
      });
    } else {
      missingWorstCase(ctx, "control_lost", "no worst-case temperature for its room, so a failure of its temperature control cannot be assessed");
    }
  }
  return views;
}

export function roomScenario(ctx: AssessmentContext): ScenarioView | null {
  const worstCase: WorstCase | null = ctx.room.worstCase;
  if (!worstCase) {
    missingWorstCase(ctx, "room_worst_case", "no worst-case temperature (no design maximum, readings or excursions)");
    return null;
  }
  return {
    scenario: "room_worst_case",
    tempC: worstCase.tempC,
    source: worstCase.description,
    phrase: `at the room's worst case (${formatTempC(worstCase.tempC)})`,
  };
}
