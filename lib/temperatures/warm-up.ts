import "server-only";
import type { DbOrTx } from "@/db/client";
import { preparedOn } from "@/db/client";
import type { StorageUnitKind } from "@/db/enums";
import { isTemperatureControlled } from "@/lib/assessment/rules/context";
import { formatNumber } from "@/lib/format/numbers";
import { defaultWarmUpReason, formatTauMin, warmUpDefaultFor } from "./warm-up-defaults";

/**
 * A temperature-controlled unit's warm-up time constant τ (Newton's law of heating after a failure)
 * and where it comes from: set by a person, fitted to the unit's own recorded failures, or the
 * default of its kind. Set beats fitted beats default.
 */
export type UnitWarmUp = {
  tauMin: number;
  source: "fitted" | "default" | "set";
  /** The latest fit, also when a person's value overrides it; null when the unit has none. */
  fit: { excursions: number; readings: number; rmsErrorC: number; fittedAt: Date } | null;
  /** One sentence for traces and the unit page. */
  reason: string;
};

type Row = {
  id: number;
  kind: StorageUnitKind;
  setMinC: number | null;
  setMaxC: number | null;
  tauSetMin: number | null;
  tauNote: string | null;
  fitTauMin: number | null;
  rmsErrorC: number | null;
  excursionCount: number | null;
  readingCount: number | null;
  fittedAtMs: number | null;
  roomTempSource: "sensor" | "design" | null;
};

// The latest fit of each unit is its row with the highest id (rows are only ever appended).
const WARM_UPS_SQL = `
  select u.id as id, u.kind as kind, u.set_min_c as setMinC, u.set_max_c as setMaxC,
         u.warm_up_tau_min as tauSetMin, u.warm_up_tau_note as tauNote,
         f.tau_min as fitTauMin, f.rms_error_c as rmsErrorC, f.excursion_count as excursionCount,
         f.reading_count as readingCount, f.fitted_at as fittedAtMs, f.room_temp_source as roomTempSource
  from storage_units u
  left join warm_up_fits f on f.id = (select max(w.id) from warm_up_fits w where w.storage_unit_id = u.id)
  where u.id in (select value from json_each(?))`;

/** Is a unit of this kind and set range temperature-controlled (assessed in control and with control lost)? */
export function unitIsTemperatureControlled(unit: { kind: StorageUnitKind; setMinC: number | null; setMaxC: number | null }): boolean {
  const setRange = unit.setMinC === null && unit.setMaxC === null ? null : { minC: unit.setMinC, maxC: unit.setMaxC };
  return isTemperatureControlled({ kind: unit.kind, setRange } as Parameters<typeof isTemperatureControlled>[0]);
}

function plural(count: number, word: string, many = `${word}s`): string {
  return `${count} ${count === 1 ? word : many}`;
}

/** "fitted to 2 recorded failures of this unit (41 readings, RMS error 0.4 °C)". */
export function describeFit(fit: { excursions: number; readings: number; rmsErrorC: number }, roomTempSource?: "sensor" | "design" | null): string {
  const room =
    roomTempSource === "sensor" ? ", against the room's own sensor readings" : roomTempSource === "design" ? ", against the room's design maximum (no room sensor readings)" : "";
  return `fitted to ${plural(fit.excursions, "recorded failure")} of this unit (${plural(fit.readings, "reading")}, RMS error ${formatNumber(fit.rmsErrorC, 2)} °C${room})`;
}

function warmUpOf(row: Row): UnitWarmUp {
  const fit =
    row.fitTauMin !== null && row.fittedAtMs !== null
      ? { excursions: row.excursionCount ?? 0, readings: row.readingCount ?? 0, rmsErrorC: row.rmsErrorC ?? 0, fittedAt: new Date(row.fittedAtMs) }
      : null;
  if (row.tauSetMin !== null) {
    const note = row.tauNote?.trim();
    return {
      tauMin: row.tauSetMin,
      source: "set",
      fit,
      reason: `τ = ${formatTauMin(row.tauSetMin)}, set for this unit by a person${note ? ` (“${note}”)` : ""}${fit ? `; the fit to its recorded failures gives ${formatTauMin(row.fitTauMin as number)}` : ""}`,
    };
  }
  if (fit) {
    return { tauMin: row.fitTauMin as number, source: "fitted", fit, reason: `τ = ${formatTauMin(row.fitTauMin as number)}, ${describeFit(fit, row.roomTempSource)}` };
  }
  return { tauMin: warmUpDefaultFor(row.kind).tauMin, source: "default", fit: null, reason: defaultWarmUpReason(row.kind) };
}

/**
 * The warm-up of each temperature-controlled unit among `unitIds`, in one query. Units that are not
 * temperature-controlled (and ids that do not exist) are left out of the map.
 */
export function warmUpsOfUnits(db: DbOrTx, unitIds: number[]): Map<number, UnitWarmUp> {
  const result = new Map<number, UnitWarmUp>();
  if (unitIds.length === 0) return result;
  const rows = preparedOn(db, WARM_UPS_SQL).all(JSON.stringify([...new Set(unitIds)])) as Row[];
  for (const row of rows) {
    if (!unitIsTemperatureControlled(row)) continue;
    result.set(row.id, warmUpOf(row));
  }
  return result;
}
