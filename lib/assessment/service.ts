import "server-only";
import { createHash } from "node:crypto";
import { and, eq, inArray, isNull } from "drizzle-orm";
import { getDb, preparedOn, type DbOrTx } from "@/db/client";
import {
  exposureLimits,
  mixtureComponents,
  mixtures,
  quantityLimits,
  rooms,
  sensors,
  settings,
  sites,
  storageUnits,
  substances,
  type Container,
} from "@/db/schema";
import { queueFindingAlerts } from "@/lib/alerts/finding-alerts";
import { queueFindingWebhooks } from "@/lib/webhooks/domain-events";
import { reconcileFindings, type FindingCandidate, type ReconcileResult } from "@/lib/register/store";
import { worstCasesForRooms } from "@/lib/temperatures/queries";
import { selectWorstCase } from "@/lib/temperatures/worst-case";
import { warmUpsOfUnits } from "@/lib/temperatures/warm-up";
import { PROCESS_KEY } from "./process-key";
import {
  assessLocation,
  assessmentSettingsSchema,
  buildMixtureSnapshot,
  buildSubstanceSnapshot,
  createAssessmentCache,
  DEFAULT_ASSESSMENT_SETTINGS,
  type AssessmentSettings,
  type CandidateFinding,
  type LocationSnapshot,
  type MixtureSnapshot,
  type QuantityLimitSetting,
  type RoomInfo,
  type StoredLiquid,
  type SubstanceSnapshot,
  type UnitInfo,
} from "./rules";

export const ASSESSMENT_SETTINGS_KEY = "assessmentSettings";

/**
 * The settings the rules apply: the safety officers' stored values over the defaults, and the
 * organisation's quantity limits (the example limits until it has entered its own).
 */
export function loadAssessmentSettings(db: DbOrTx = getDb()): AssessmentSettings {
  const row = db.select({ value: settings.value }).from(settings).where(eq(settings.key, ASSESSMENT_SETTINGS_KEY)).get();
  const parsed = row ? assessmentSettingsSchema.safeParse(row.value) : null;
  const base = parsed?.success ? parsed.data : DEFAULT_ASSESSMENT_SETTINGS;
  const stored = db.select().from(quantityLimits).all();
  if (stored.length === 0) return base;
  const limits: QuantityLimitSetting[] = stored.map((limit) => ({
    id: limit.id,
    name: `${limit.liquidClasses.join("+")} per ${limit.scope.replace("_", " ")}`,
    scope: limit.scope,
    liquidClasses: limit.liquidClasses,
    maxVolumeL: limit.maxVolumeL,
    sprinkleredMaxVolumeL: limit.sprinkleredMaxVolumeL,
    basis: limit.basis,
  }));
  return { ...base, quantities: { ...base.quantities, limits } };
}

/** Substances and mixtures built once per run and shared by every location (the engine caches on them). */
export class SnapshotLibrary {
  private readonly substances = new Map<number, SubstanceSnapshot>();
  private readonly mixtures = new Map<number, MixtureSnapshot>();
  constructor(private readonly db: DbOrTx) {}

  load(substanceIds: number[], mixtureIds: number[]): void {
    const wantedMixtures = mixtureIds.filter((id) => !this.mixtures.has(id));
    const components = wantedMixtures.length ? this.db.select().from(mixtureComponents).where(inArray(mixtureComponents.mixtureId, wantedMixtures)).all() : [];
    const wantedSubstances = [...new Set([...substanceIds, ...components.map((c) => c.substanceId)])].filter((id) => !this.substances.has(id));
    for (let i = 0; i < wantedSubstances.length; i += 500) {
      const ids = wantedSubstances.slice(i, i + 500);
      const limits = this.db.select().from(exposureLimits).where(inArray(exposureLimits.substanceId, ids)).all();
      for (const row of this.db.select().from(substances).where(inArray(substances.id, ids)).all()) {
        this.substances.set(
          row.id,
          buildSubstanceSnapshot({
            id: row.id,
            name: row.name,
            cas: row.cas,
            physicalState: row.physicalState,
            molarMassGPerMol: row.molarMassGPerMol,
            correlations: row.correlations,
            normalBoilingPointC: row.normalBoilingPointC,
            enthalpyOfVaporizationKJPerMol: row.enthalpyOfVaporizationKJPerMol,
            meltingPointC: row.meltingPointC,
            flashPointC: row.flashPointC,
            lflVolPercent: row.lflVolPercent,
            uflVolPercent: row.uflVolPercent,
            liquidDensityKgPerM3: row.liquidDensityKgPerM3,
            exposureLimits: limits.filter((l) => l.substanceId === row.id).map((l) => ({ kind: l.kind, value: l.value, unit: l.unit, body: l.body, source: l.source })),
            sources: row.sources,
          }),
        );
      }
    }
    if (wantedMixtures.length) {
      for (const row of this.db.select().from(mixtures).where(inArray(mixtures.id, wantedMixtures)).all()) {
        this.mixtures.set(
          row.id,
          buildMixtureSnapshot({
            id: row.id,
            name: row.name,
            fractionBasis: row.fractionBasis,
            components: components.filter((c) => c.mixtureId === row.id && this.substances.has(c.substanceId)).map((c) => ({ substance: this.substances.get(c.substanceId)!, fraction: c.fraction })),
          }),
        );
      }
    }
  }

  private readonly digests = new WeakMap<object, string>();

  /** A digest of everything the rules may read of a substance or mixture (computed once per run). */
  digest(content: StoredLiquid["content"]): string {
    const data = content.kind === "substance" ? content.substance : content.mixture;
    let digest = this.digests.get(data);
    if (digest === undefined) {
      digest = createHash("sha1").update(JSON.stringify(data)).digest("base64");
      this.digests.set(data, digest);
    }
    return digest;
  }

  content(substanceId: number | null, mixtureId: number | null): StoredLiquid["content"] | null {
    if (substanceId != null) {
      const substance = this.substances.get(substanceId);
      return substance ? { kind: "substance", substance } : null;
    }
    const mixture = mixtureId != null ? this.mixtures.get(mixtureId) : undefined;
    return mixture ? { kind: "mixture", mixture } : null;
  }
}

/**
 * A container that is not stored (yet) as it would be: the what-if preview. `replacesContainerId`
 * leaves that stored container out (an edit of it); `state` defaults to sealed.
 */
export type ExtraContent = {
  storageUnitId: number;
  substanceId: number | null;
  mixtureId: number | null;
  amount: number;
  amountUnit: StoredLiquid["amountUnit"];
  label: string;
  state?: StoredLiquid["state"];
  replacesContainerId?: number;
};

type ContainerRow = Pick<Container, "id" | "label" | "substanceId" | "mixtureId" | "amount" | "amountUnit" | "state" | "storageUnitId">;

/** Everything the rules need about some rooms and their units, read in a handful of queries. */
export function buildSnapshots(db: DbOrTx, roomIds: number[], nowMs: number, library = new SnapshotLibrary(db), extra: ExtraContent[] = []): LocationSnapshot[] {
  if (roomIds.length === 0) return [];
  const roomRows = db
    .select({ room: rooms, pressureKPa: sites.atmosphericPressureKPa })
    .from(rooms)
    .innerJoin(sites, eq(sites.id, rooms.siteId))
    .where(and(inArray(rooms.id, roomIds), isNull(rooms.retiredAt), isNull(sites.retiredAt)))
    .all();
  const liveRoomIds = roomRows.map((r) => r.room.id);
  if (liveRoomIds.length === 0) return [];
  const unitRows = db.select().from(storageUnits).where(and(inArray(storageUnits.roomId, liveRoomIds), isNull(storageUnits.retiredAt))).all();
  const unitIds = unitRows.map((u) => u.id);
  // Straight from SQLite: for 100,000 containers the query builder's row mapping costs more than the query.
  let containerRows = unitIds.length
    ? (preparedOn(
        db,
        `select id, label, substance_id as substanceId, mixture_id as mixtureId, amount, amount_unit as amountUnit, state, storage_unit_id as storageUnitId
           from containers where storage_unit_id in (select value from json_each(?)) and state not in ('empty', 'disposed')`,
      ).all(JSON.stringify(unitIds)) as ContainerRow[])
    : [];
  // A container that is not stored (the what-if preview): id 0 or the id of the one it stands in for.
  const replaced = new Set(extra.flatMap((e) => (e.replacesContainerId == null ? [] : [e.replacesContainerId])));
  if (replaced.size) containerRows = containerRows.filter((c) => !replaced.has(c.id));
  for (const e of extra) {
    if (e.state === "empty" || e.state === "disposed") continue;
    containerRows.push({ id: e.replacesContainerId ?? 0, label: e.label, substanceId: e.substanceId, mixtureId: e.mixtureId, amount: e.amount, amountUnit: e.amountUnit, state: e.state ?? "sealed", storageUnitId: e.storageUnitId });
  }
  library.load(
    [...new Set(containerRows.flatMap((c) => (c.substanceId == null ? [] : [c.substanceId])))],
    [...new Set(containerRows.flatMap((c) => (c.mixtureId == null ? [] : [c.mixtureId])))],
  );
  const byUnit = new Map<number, StoredLiquid[]>();
  for (const c of containerRows) {
    const content = library.content(c.substanceId, c.mixtureId);
    if (!content) continue;
    const list = byUnit.get(c.storageUnitId) ?? [];
    list.push({ containerId: c.id, label: c.label, content, amount: c.amount, amountUnit: c.amountUnit, state: c.state });
    byUnit.set(c.storageUnitId, list);
  }
  const worstCases = worstCasesForRooms(db, liveRoomIds, nowMs);
  const warmUps = new Map([...warmUpsOfUnits(db, unitRows.map((u) => u.id))].map(([id, w]) => [id, { tauMin: w.tauMin, source: w.source, reason: w.reason }]));
  const unitsByRoom = new Map<number, (typeof unitRows)[number][]>();
  for (const u of unitRows) {
    const list = unitsByRoom.get(u.roomId) ?? [];
    list.push(u);
    unitsByRoom.set(u.roomId, list);
  }
  const snapshots: LocationSnapshot[] = [];
  for (const { room: r, pressureKPa } of roomRows) {
    const room: RoomInfo = {
      id: r.id,
      siteId: r.siteId,
      code: r.code,
      name: r.name,
      kind: r.kind,
      volumeM3: r.floorAreaM2 != null && r.heightM != null ? r.floorAreaM2 * r.heightM : null,
      floorAreaM2: r.floorAreaM2,
      airChangesPerHour: r.airChangesPerHour,
      mixingFactor: r.mixingFactor,
      sprinklered: r.sprinklered,
      atmosphericPressureKPa: pressureKPa,
      worstCase: selectWorstCase(worstCases.room(r.id)),
    };
    const units = unitsByRoom.get(r.id) ?? [];
    snapshots.push({ kind: "room", room, contents: units.flatMap((u) => byUnit.get(u.id) ?? []) });
    for (const u of units) {
      const worst = worstCases.unit(u);
      const unit: UnitInfo = {
        id: u.id,
        code: u.code,
        name: u.name,
        kind: u.kind,
        internalVolumeL: u.internalVolumeL,
        ventilated: u.ventilated,
        ignitionSourceFree: u.ignitionSourceFree,
        setRange: u.setMinC == null && u.setMaxC == null ? null : { minC: u.setMinC, maxC: u.setMaxC },
        warmUp: warmUps.get(u.id) ?? null,
        worstCase: { inControl: worst.controlled ? worst.inControl : null, controlLost: worst.controlLost },
      };
      snapshots.push({ kind: "unit", unit, room, contents: byUnit.get(u.id) ?? [] });
    }
  }
  return snapshots;
}

/**
 * The stored shape of a candidate. The trace stays lazy (built only when the register writes it:
 * a new or changed finding), because building and serialising every trace costs more than the
 * assessment itself.
 */
export function toStoredCandidate(c: CandidateFinding): FindingCandidate {
  return {
    fingerprint: c.fingerprint,
    rule: c.rule,
    severity: c.severity,
    scenario: c.scenario,
    title: c.title,
    siteId: c.siteId,
    roomId: c.roomId,
    storageUnitId: c.storageUnitId,
    containerId: c.containerId || null,
    substanceId: c.substanceId,
    mixtureId: c.mixtureId,
    value: c.value,
    limitValue: c.limitValue,
    ratio: c.ratio,
    unit: c.unit,
    worstCaseTempC: c.worstCaseTempC,
    worstCaseSource: c.worstCaseSource,
    timeToDanger: c.timeToDanger,
    get trace() {
      return c.trace;
    },
  };
}

export type ReassessResult = ReconcileResult & {
  rooms: number;
  units: number;
  /** Rooms whose inputs were those of their last assessment (in this process): their findings stand as they are. */
  roomsUnchanged: number;
  alertsQueued: number;
};


/**
 * Everything the rules read for one location, as one digest: the settings, the room's facts with
 * its worst case, for a unit its facts and worst cases, and every container there (for the room:
 * in all its units) with the full data of each substance and mixture. The rules are pure functions
 * of exactly this (a LocationSnapshot and the settings), so equal digests mean equal candidates.
 */
function inputKey(settingsJson: string, snapshot: LocationSnapshot, library: SnapshotLibrary): string {
  const hash = createHash("sha1").update(PROCESS_KEY).update(settingsJson).update(JSON.stringify(snapshot.room));
  if (snapshot.kind === "unit") hash.update(JSON.stringify(snapshot.unit));
  for (const liquid of snapshot.contents) {
    hash.update(`${liquid.containerId}|${liquid.label}|${liquid.amount}|${liquid.amountUnit}|${liquid.state}|${library.digest(liquid.content)};`);
  }
  return hash.digest("base64");
}

type StoredKey = { id: number; inputKey: string | null; assessedAt: number | null };

/**
 * Re-assesses these rooms with all their units, in the caller's transaction, and brings their
 * findings in line (raise, update, resolve, re-open), queueing the alerts for critical and high
 * ones. A retired room or unit has no candidates, so its findings resolve themselves.
 *
 * A location (a room's own rules, or one unit) whose input digest (inputKey) is the one stored by
 * its last assessment in this process is not assessed again — unless a person has changed one of
 * its findings since (a finding marked resolved while its condition holds re-opens) or an accepted
 * risk's review date has passed — nor when `force` is set. Moving one container thus re-assesses
 * the two units and the two rooms' own rules, not every unit of both rooms. The digests are stored
 * in the same transaction; every room's assessed_at moves (see lastAssessedAt).
 */
export function reassessRooms(
  tx: DbOrTx,
  roomIds: number[],
  opts: { reason?: string; nowMs?: number; notify?: boolean; settings?: AssessmentSettings; library?: SnapshotLibrary; force?: boolean } = {},
): ReassessResult {
  const nowMs = opts.nowMs ?? Date.now();
  const ids = [...new Set(roomIds)];
  const empty: ReassessResult = { raised: 0, updated: 0, resolved: 0, reopened: 0, unchanged: 0, changes: [], rooms: 0, units: 0, roomsUnchanged: 0, alertsQueued: 0 };
  if (ids.length === 0) return empty;
  const settingsNow = opts.settings ?? loadAssessmentSettings(tx);
  const library = opts.library ?? new SnapshotLibrary(tx);
  const snapshots = buildSnapshots(tx, ids, nowMs, library);
  const settingsJson = JSON.stringify(settingsNow);
  const keyed = snapshots.map((snapshot) => ({ snapshot, key: inputKey(settingsJson, snapshot, library) }));

  // Locations whose digest is unchanged and whose findings nobody has touched since.
  const unchangedRooms = new Set<number>();
  const unchangedUnits = new Set<number>();
  if (!opts.force && keyed.length) {
    const json = (list: number[]) => JSON.stringify(list);
    const roomKeys = new Map(keyed.flatMap(({ snapshot, key }) => (snapshot.kind === "room" ? [[snapshot.room.id, key] as const] : [])));
    const unitKeys = new Map(keyed.flatMap(({ snapshot, key }) => (snapshot.kind === "unit" ? [[snapshot.unit.id, key] as const] : [])));
    const same = (rows: StoredKey[], keys: Map<number, string>) => rows.filter((row) => row.inputKey != null && row.assessedAt != null && row.inputKey === keys.get(row.id));
    const sameRooms = same(preparedOn(tx, "select id, assessment_input_key as inputKey, assessed_at as assessedAt from rooms where id in (select value from json_each(?))").all(json([...roomKeys.keys()])) as StoredKey[], roomKeys);
    const sameUnits = same(preparedOn(tx, "select id, assessment_input_key as inputKey, assessed_at as assessedAt from storage_units where id in (select value from json_each(?))").all(json([...unitKeys.keys()])) as StoredKey[], unitKeys);
    if (sameRooms.length || sameUnits.length) {
      // Per location: the latest change to any of its findings, and the earliest review date of an accepted risk.
      const activity = preparedOn(
        tx,
        `select room_id as roomId, storage_unit_id as unitId, max(updated_at) as lastChange,
                min(case when status = 'risk_accepted' then risk_accepted_until end) as nextReview
           from findings where room_id in (select value from json_each(?)) group by room_id, storage_unit_id`,
      ).all(json(ids)) as { roomId: number; unitId: number | null; lastChange: number; nextReview: number | null }[];
      const roomActivity = new Map(activity.filter((a) => a.unitId == null).map((a) => [a.roomId, a]));
      const unitActivity = new Map(activity.filter((a) => a.unitId != null).map((a) => [a.unitId!, a]));
      const quiet = (row: StoredKey, found: { lastChange: number; nextReview: number | null } | undefined) =>
        !found || (found.lastChange <= row.assessedAt! && (found.nextReview == null || found.nextReview > nowMs));
      for (const row of sameRooms) if (quiet(row, roomActivity.get(row.id))) unchangedRooms.add(row.id);
      for (const row of sameUnits) if (quiet(row, unitActivity.get(row.id))) unchangedUnits.add(row.id);
    }
  }
  const isUnchanged = (snapshot: LocationSnapshot) => (snapshot.kind === "room" ? unchangedRooms.has(snapshot.room.id) : unchangedUnits.has(snapshot.unit.id));

  const cache = createAssessmentCache();
  const candidates = keyed.filter(({ snapshot }) => !isUnchanged(snapshot)).flatMap(({ snapshot }) => assessLocation(snapshot, settingsNow, { cache }).map(toStoredCandidate));
  // Every unit of these rooms (retired ones too, whose findings resolve) except those left as they were.
  const unitIds = tx.select({ id: storageUnits.id }).from(storageUnits).where(inArray(storageUnits.roomId, ids)).all().map((u) => u.id).filter((id) => !unchangedUnits.has(id));
  const scopeRooms = ids.filter((id) => !unchangedRooms.has(id));
  const result =
    scopeRooms.length || unitIds.length
      ? reconcileFindings(tx, { roomIds: scopeRooms, storageUnitIds: unitIds }, candidates, { nowMs, reason: opts.reason })
      : { raised: 0, updated: 0, resolved: 0, reopened: 0, unchanged: 0, changes: [] };
  const setRoom = preparedOn(tx, "update rooms set assessment_input_key = ?, assessed_at = ? where id = ?");
  const setUnit = preparedOn(tx, "update storage_units set assessment_input_key = ?, assessed_at = ? where id = ?");
  const keyedRooms = new Set<number>();
  const keyedUnits = new Set<number>();
  for (const { snapshot, key } of keyed) {
    if (snapshot.kind === "room") {
      keyedRooms.add(snapshot.room.id);
      setRoom.run(key, nowMs, snapshot.room.id);
    } else {
      keyedUnits.add(snapshot.unit.id);
      if (!unchangedUnits.has(snapshot.unit.id)) setUnit.run(key, nowMs, snapshot.unit.id);
    }
  }
  // A retired room or unit has no digest: if it comes back, it is assessed in full (its findings resolved meanwhile).
  const clearRoom = preparedOn(tx, "update rooms set assessment_input_key = null where id = ?");
  const clearUnit = preparedOn(tx, "update storage_units set assessment_input_key = null where id = ?");
  for (const id of ids) if (!keyedRooms.has(id)) clearRoom.run(id);
  for (const id of unitIds) if (!keyedUnits.has(id)) clearUnit.run(id);
  const alertsQueued = opts.notify === false ? 0 : queueFindingAlerts(tx, result.changes);
  if (opts.notify !== false) queueFindingWebhooks(tx, result.changes, result.resolvedIds ?? [], new Date(nowMs));
  return {
    ...result,
    rooms: snapshots.filter((s) => s.kind === "room").length,
    units: snapshots.filter((s) => s.kind === "unit").length,
    roomsUnchanged: [...unchangedRooms].filter((roomId) => keyed.every(({ snapshot }) => snapshot.kind !== "unit" || snapshot.room.id !== roomId || unchangedUnits.has(snapshot.unit.id))).length,
    alertsQueued,
  };
}

/** The rooms that hold these units. */
export function roomsOfUnits(tx: DbOrTx, unitIds: (number | null | undefined)[]): number[] {
  const ids = [...new Set(unitIds.filter((id): id is number => id != null))];
  if (ids.length === 0) return [];
  return [...new Set(tx.select({ roomId: storageUnits.roomId }).from(storageUnits).where(inArray(storageUnits.id, ids)).all().map((u) => u.roomId))];
}

/** The rooms where these sensors hang (a unit's sensor counts for the unit's room). */
export function roomsOfSensors(tx: DbOrTx, sensorIds: number[]): number[] {
  if (sensorIds.length === 0) return [];
  const rows = tx.select({ roomId: sensors.roomId, storageUnitId: sensors.storageUnitId }).from(sensors).where(inArray(sensors.id, [...new Set(sensorIds)])).all();
  return [...new Set([...rows.flatMap((r) => (r.roomId == null ? [] : [r.roomId])), ...roomsOfUnits(tx, rows.map((r) => r.storageUnitId))])];
}
