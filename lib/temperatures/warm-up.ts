import "server-only";
import { preparedOn, type DbOrTx } from "@/db/client";
import type { StorageUnitKind } from "@/db/enums";

/** A unit's warm-up time constant after a failure, and where it comes from: set by a person, fitted to its recorded failures, or its kind's default. */
export type UnitWarmUp = {
  tauMin: number;
  source: "fitted" | "default" | "set";
  fit: { excursions: number; readings: number; rmsErrorC: number; fittedAt: Date } | null;
  reason: string;
};

const REFRIGERATED: ReadonlySet<StorageUnitKind> = new Set([
  "domestic_refrigerator",
  "flammable_storage_refrigerator",
  "explosion_proof_refrigerator",
  "freezer_minus_20",
  "freezer_minus_80",
]);

/** Default τ per kind (minutes) where a unit has no fit and none was set. */
const DEFAULT_TAU_MIN: Partial<Record<StorageUnitKind, number>> = {
  domestic_refrigerator: 240,
  flammable_storage_refrigerator: 240,
  explosion_proof_refrigerator: 240,
  freezer_minus_20: 480,
  freezer_minus_80: 720,
};
const DEFAULT_OTHER_TAU_MIN = 240;

export function formatTauMin(tauMin: number): string {
  const total = Math.round(tauMin);
  const h = Math.floor(total / 60);
  const m = total % 60;
  return h === 0 ? `${m} min` : m === 0 ? `${h} h` : `${h} h ${m} min`;
}

type Row = {
  id: number;
  kind: StorageUnitKind;
  setMinC: number | null;
  setMaxC: number | null;
  tauSet: number | null;
  tauNote: string | null;
  fitTau: number | null;
  fitRms: number | null;
  fitExcursions: number | null;
  fitReadings: number | null;
  fittedAt: number | null;
};

/** The warm-up of each temperature-controlled unit among these (set beats fitted beats default), in one query. */
export function warmUpsOfUnits(db: DbOrTx, unitIds: number[]): Map<number, UnitWarmUp> {
  const out = new Map<number, UnitWarmUp>();
  if (unitIds.length === 0) return out;
  const rows = preparedOn(
    db,
    `select u.id, u.kind, u.set_min_c as setMinC, u.set_max_c as setMaxC, u.warm_up_tau_min as tauSet, u.warm_up_tau_note as tauNote,
       f.tau_min as fitTau, f.rms_error_c as fitRms, f.excursion_count as fitExcursions, f.reading_count as fitReadings, f.fitted_at as fittedAt
     from storage_units u
     left join warm_up_fits f on f.id = (select id from warm_up_fits where storage_unit_id = u.id order by fitted_at desc, id desc limit 1)
     where u.id in (select value from json_each(?))`,
  ).all(JSON.stringify(unitIds)) as Row[];
  for (const row of rows) {
    const controlled = REFRIGERATED.has(row.kind) || row.setMinC != null || row.setMaxC != null;
    if (!controlled) continue;
    const fit =
      row.fitTau != null
        ? { excursions: row.fitExcursions ?? 0, readings: row.fitReadings ?? 0, rmsErrorC: row.fitRms ?? 0, fittedAt: new Date(row.fittedAt ?? 0) }
        : null;
    if (row.tauSet != null) {
      out.set(row.id, { tauMin: row.tauSet, source: "set", fit, reason: `τ = ${formatTauMin(row.tauSet)}, set for this unit${row.tauNote ? `: ${row.tauNote}` : ""}` });
    } else if (fit && row.fitTau != null) {
      out.set(row.id, {
        tauMin: row.fitTau,
        source: "fitted",
        fit,
        reason: `τ = ${formatTauMin(row.fitTau)}, fitted to ${fit.excursions} recorded failure${fit.excursions === 1 ? "" : "s"} of this unit (${fit.readings} readings, RMS error ${fit.rmsErrorC.toFixed(1)} °C)`,
      });
    } else {
      const tau = DEFAULT_TAU_MIN[row.kind] ?? DEFAULT_OTHER_TAU_MIN;
      out.set(row.id, { tauMin: tau, source: "default", fit: null, reason: `τ = ${formatTauMin(tau)}, the default for its kind (no recorded failure to fit)` });
    }
  }
  return out;
}
