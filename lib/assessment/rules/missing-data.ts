/**
 * missing-data: nothing is skipped silently. Every rule that lacks a value it needs reports it
 * through the context (AssessmentContext.missing), which raises one finding per kind of gap and
 * subject in a location. This module holds the location-level checks (room and unit volumes, air
 * changes) and the labels of the kinds.
 */
import { traceValue } from "@/lib/hazard";
import type { AssessmentContext } from "./context";
import type { EnclosureVolume } from "./enclosure";
import { formatSignificant } from "./format";
import type { MissingDataKind, UnitInfo } from "./types";

export const MISSING_DATA_LABELS: Record<MissingDataKind, string> = {
  "no-vapor-pressure-method": "No vapor-pressure correlation and no boiling point",
  "no-correlation": "No vapor-pressure correlation (Clausius–Clapeyron estimate used)",
  "no-lfl": "No LFL for a flammable liquid",
  "no-flash-point": "No flash point for a liquid with an LFL",
  "no-room-volume": "No room volume",
  "no-air-changes": "No air changes per hour",
  "no-unit-volume": "No internal volume of a closed unit",
  "no-worst-case": "No worst-case temperature",
  "no-density": "No liquid density to convert between mass and volume",
  "no-exposure-limit": "No exposure limit",
  "no-expansion-data": "No density of a cryogen",
  "calculation-failed": "A calculation failed on the stored data",
};

/** The free volume of a closed unit: internal volume less the liquid in it (at least 10 % of the internal volume). */
export function unitEnclosureVolume(ctx: AssessmentContext, unit: UnitInfo): EnclosureVolume {
  if (unit.internalVolumeL === null || !(unit.internalVolumeL > 0)) {
    ctx.missing({
      kind: "no-unit-volume",
      subject: { kind: "location", key: "unit-volume" },
      subjectName: unit.code,
      scenario: ctx.primaryScenario,
      what: "no internal volume",
      consequence: "its vapor is bounded by the saturated concentration alone (the all-evaporated bound needs the volume), which can overstate it",
    });
    return { freeVolumeM3: null, inputs: [traceValue("Internal volume of the unit", "V_int", "unknown", "")], warnings: [] };
  }
  const internalM3 = unit.internalVolumeL / 1000;
  let liquidL = 0;
  for (const group of ctx.groups) for (const container of group.containers) liquidL += container.volumeL ?? 0;
  const warnings: string[] = [];
  let freeVolumeM3 = internalM3 - liquidL / 1000;
  if (freeVolumeM3 < 0.1 * internalM3) {
    warnings.push(
      `The liquid recorded in ${unit.code} (${formatSignificant(liquidL)} L) leaves less than 10 % of its ${formatSignificant(unit.internalVolumeL)} L free: 10 % is used; check the inventory and the internal volume`,
    );
    freeVolumeM3 = 0.1 * internalM3;
  }
  return {
    freeVolumeM3,
    inputs: [
      traceValue("Internal volume of the unit", "V_int", internalM3, "m³", "storage unit data"),
      traceValue("Liquid stored in it", "V_liq", liquidL / 1000, "m³", "sum of the containers"),
      traceValue("Free volume", "V_free", freeVolumeM3, "m³", "V_free = V_int − V_liq"),
    ],
    warnings,
  };
}

/** The room as an enclosure (unventilated): its volume, or the saturation bound alone without one. */
export function roomEnclosureVolume(ctx: AssessmentContext): EnclosureVolume {
  const volumeM3 = ctx.room.volumeM3;
  if (volumeM3 === null || !(volumeM3 > 0)) {
    ctx.missing({
      kind: "no-room-volume",
      subject: { kind: "location", key: "room-volume" },
      subjectName: `room ${ctx.room.code}`,
      scenario: "room_worst_case",
      what: "no volume (floor area and height)",
      consequence: "its air is bounded by the saturated concentration alone, and spills, oxygen and CO₂ cannot be computed",
    });
    return { freeVolumeM3: null, inputs: [traceValue("Room volume", "V_room", "unknown", "")], warnings: [] };
  }
  return {
    freeVolumeM3: volumeM3,
    inputs: [traceValue("Room volume (free volume)", "V_free", volumeM3, "m³", "floor area × height")],
    warnings: [],
  };
}

/** Air changes: unknown → reported, and the room is assessed as unventilated (the conservative choice). */
export function airChangesKnown(ctx: AssessmentContext): boolean {
  if (ctx.room.airChangesPerHour !== null) return true;
  ctx.missing({
    kind: "no-air-changes",
    subject: { kind: "location", key: "air-changes" },
    subjectName: `room ${ctx.room.code}`,
    scenario: "room_worst_case",
    what: "no air changes per hour",
    consequence: "it is assessed as unventilated: its air is bounded like a closed enclosure's instead of by the spill model",
  });
  return false;
}
