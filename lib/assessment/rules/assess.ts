/**
 * assessLocation: every rule for every scenario of one room or storage unit.
 *
 * - A room at its worst case: the room as an enclosure when it is unventilated (or its air
 *   changes are unknown), else a spill of the largest container of each liquid; room quantity
 *   limits; oxygen and CO₂ after its cryogens and dry ice are released; flammable liquids in a
 *   cold room.
 * - A temperature-controlled unit in control and with control lost; a unit without control at
 *   its own worst case (or its room's): the enclosure bound if it is closed, flash point and
 *   boiling point; once per unit, flammable liquids where its interior has ignition sources and its
 *   quantity limits.
 * - Data missing for any of these raises a missing-data finding.
 */
import { createAssessmentCache, type AssessmentCache } from "./cache";
import { AssessmentContext, Finding, isClosedUnit, type ScenarioView } from "./context";
import { cryogenRules } from "./cryogens";
import { enclosureRule } from "./enclosure";
import { flashPointAndBoilingRules } from "./flash-point-and-boiling";
import { ignitionSourceRule } from "./ignition-sources";
import { airChangesKnown, roomEnclosureVolume, unitEnclosureVolume } from "./missing-data";
import { quantityRule } from "./quantities";
import { roomScenario, unitScenarios } from "./scenarios";
import { DEFAULT_ASSESSMENT_SETTINGS } from "./severity";
import { spillRules } from "./spill";
import { attachTimeToDanger } from "./time-to-danger";
import type { AssessmentSettings, CandidateFinding, LocationSnapshot } from "./types";

export type AssessOptions = {
  /** Share one cache between the locations of a run: Psat is then computed once per substance and temperature. */
  cache?: AssessmentCache;
};

export function assessLocation(
  snapshot: LocationSnapshot,
  settings: AssessmentSettings = DEFAULT_ASSESSMENT_SETTINGS,
  options: AssessOptions = {},
): CandidateFinding[] {
  const ctx = new AssessmentContext(snapshot, settings, options.cache ?? createAssessmentCache());
  if (ctx.unit !== null) {
    const views = assessUnit(ctx);
    attachTimeToDanger(snapshot, settings, ctx.results() as Finding[], {
      inControl: views.find((v) => v.scenario === "in_control") ?? null,
      controlLost: views.find((v) => v.scenario === "control_lost") ?? null,
    });
  } else assessRoom(ctx);
  return ctx.results();
}

function assessUnit(ctx: AssessmentContext): ScenarioView[] {
  const unit = ctx.unit;
  if (unit === null) return [];
  const views = unitScenarios(ctx);
  ignitionSourceRule(ctx);
  quantityRule(ctx);
  const volume = isClosedUnit(unit) && ctx.liquidGroups().length > 0 ? unitEnclosureVolume(ctx, unit) : null;
  for (const view of views) {
    if (volume) enclosureRule(ctx, view, volume);
    flashPointAndBoilingRules(ctx, view);
  }
  return views;
}

function assessRoom(ctx: AssessmentContext): void {
  const view = roomScenario(ctx);
  ignitionSourceRule(ctx);
  quantityRule(ctx);
  cryogenRules(ctx, view);
  if (view === null || ctx.liquidGroups().length === 0) return;
  const ventilated = airChangesKnown(ctx) && (ctx.room.airChangesPerHour as number) > 0;
  if (!ventilated) {
    enclosureRule(ctx, view, roomEnclosureVolume(ctx));
    return;
  }
  if (ctx.room.volumeM3 === null || !(ctx.room.volumeM3 > 0)) {
    roomEnclosureVolume(ctx); // reports the missing volume
    return;
  }
  spillRules(ctx, view);
}
