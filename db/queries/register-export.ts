import "server-only";
import { and, asc, count, eq, gt, inArray, isNull, ne, sql, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import type { Db, DbOrTx } from "@/db/client";
import {
  containers,
  excursions,
  exposureLimits,
  findings,
  quantityLimits,
  readings,
  rooms,
  sensors,
  settings,
  sites,
  storageUnits,
  substances,
  traceSources,
  users,
  type FindingStatus,
  type Severity,
} from "@/db/schema";

/**
 * The register workbook's reads. The long tables (findings, traces, containers, excursions) are
 * read in pages by id (keyset: `id > after … limit n`), each page a short query of its own, so no
 * statement stays open while the workbook streams out and other requests use the connection
 * between pages. A change made during a download can therefore show in later pages only.
 */

export type ExportScope = { siteId?: number };

/** The site of a finding: its own, or its room's. */
const findingSiteId = sql<number | null>`coalesce(${findings.siteId}, ${rooms.siteId})`;

function findingInScope(scope: ExportScope): SQL | undefined {
  return scope.siteId ? sql`${findingSiteId} = ${scope.siteId}` : undefined;
}

export function findSite(db: DbOrTx, siteId: number) {
  return db.select({ id: sites.id, name: sites.name }).from(sites).where(eq(sites.id, siteId)).get() ?? null;
}

export type FindingExportRow = {
  id: number;
  severity: Severity;
  status: FindingStatus;
  rule: string;
  scenario: string;
  title: string;
  siteName: string | null;
  roomCode: string | null;
  unitCode: string | null;
  containerLabel: string | null;
  substanceName: string | null;
  cas: string | null;
  mixtureName: string | null;
  value: number | null;
  limitValue: number | null;
  ratio: number | null;
  unit: string | null;
  worstCaseTempC: number | null;
  worstCaseSource: string | null;
  /** Epoch ms. */
  firstRaisedAt: number;
  lastEvaluatedAt: number;
  resolvedAt: number | null;
  assigneeName: string | null;
  mitigationPlan: string | null;
  riskAcceptedUntil: number | null;
  fingerprint: string;
};

export type ContainerExportRow = {
  id: number;
  label: string;
  substanceName: string | null;
  cas: string | null;
  mixtureName: string | null;
  amount: number;
  amountUnit: string;
  capacity: number | null;
  capacityUnit: string | null;
  containerKind: string;
  state: string;
  siteName: string;
  roomCode: string;
  unitCode: string;
  ownerName: string | null;
  /** Epoch ms. */
  receivedAt: number | null;
  openedAt: number | null;
  expiresAt: number | null;
  notes: string | null;
};

/**
 * The pages of the three long tables, as prepared statements run straight on better-sqlite3:
 * for 100,000 findings the query builder's row mapping costs as much again as SQLite itself.
 * Timestamps stay epoch ms (the workbook writes them as dates). `@site` null means every site.
 */
export function exportPageQueries(db: Db) {
  const sqlite = db.$client;
  const findingStatement = sqlite.prepare(
    `select f.id, f.severity, f.status, f.rule, f.scenario, f.title, s.name as siteName, r.code as roomCode, u.code as unitCode,
            c.label as containerLabel, sub.name as substanceName, sub.cas as cas, m.name as mixtureName,
            f.value, f.limit_value as limitValue, f.ratio, f.unit, f.worst_case_temp_c as worstCaseTempC,
            f.worst_case_source as worstCaseSource, f.first_raised_at as firstRaisedAt, case when f.condition_holds and r.assessed_at > f.last_evaluated_at then r.assessed_at else f.last_evaluated_at end as lastEvaluatedAt,
            f.resolved_at as resolvedAt, a.name as assigneeName, f.mitigation_plan as mitigationPlan,
            f.risk_accepted_until as riskAcceptedUntil, f.fingerprint
       from findings f
       left join rooms r on r.id = f.room_id
       left join sites s on s.id = coalesce(f.site_id, r.site_id)
       left join storage_units u on u.id = f.storage_unit_id
       left join containers c on c.id = f.container_id
       left join substances sub on sub.id = f.substance_id
       left join mixtures m on m.id = f.mixture_id
       left join users a on a.id = f.assignee_id
      where f.id > @after and (@site is null or coalesce(f.site_id, r.site_id) = @site)
      order by f.id limit @limit`,
  );
  // The readable text when it was rendered with the trace; the JSON only for a trace stored before.
  const traceStatement = sqlite.prepare(
    `select f.id, f.title, t.text, t.source_ids as sourceIds, case when t.text is null then t.trace end as traceJson
       from findings f
       join finding_traces t on t.finding_id = f.id
       left join rooms r on r.id = f.room_id
      where f.id > @after and (@site is null or coalesce(f.site_id, r.site_id) = @site)
      order by f.id limit @limit`,
  );
  const containerStatement = sqlite.prepare(
    `select c.id, c.label, sub.name as substanceName, sub.cas as cas, m.name as mixtureName, c.amount, c.amount_unit as amountUnit,
            c.capacity, c.capacity_unit as capacityUnit, c.container_kind as containerKind, c.state, s.name as siteName,
            r.code as roomCode, u.code as unitCode, o.name as ownerName, c.received_at as receivedAt, c.opened_at as openedAt,
            c.expires_at as expiresAt, c.notes
       from containers c
       join storage_units u on u.id = c.storage_unit_id
       join rooms r on r.id = u.room_id
       join sites s on s.id = r.site_id
       left join substances sub on sub.id = c.substance_id
       left join mixtures m on m.id = c.mixture_id
       left join users o on o.id = c.owner_id
      where c.id > @after and c.state <> 'disposed' and (@site is null or r.site_id = @site)
      order by c.id limit @limit`,
  );
  return {
    findings: (scope: ExportScope, after: number, limit: number) => findingStatement.all({ after, limit, site: scope.siteId ?? null }) as FindingExportRow[],
    /** Findings' traces as their stored readable text (or, for an older trace, its JSON), and the ids of the sources cited. */
    traces: (scope: ExportScope, after: number, limit: number) =>
      traceStatement.all({ after, limit, site: scope.siteId ?? null }) as { id: number; title: string; text: string | null; sourceIds: string | null; traceJson: string | null }[],
    containers: (scope: ExportScope, after: number, limit: number) => containerStatement.all({ after, limit, site: scope.siteId ?? null }) as ContainerExportRow[],
  };
}

/** The cited sources with these ids (at most a few hundred at a time). */
export function traceSourcesById(db: DbOrTx, ids: number[]) {
  if (ids.length === 0) return [];
  return db.select({ id: traceSources.id, text: traceSources.text }).from(traceSources).where(inArray(traceSources.id, ids)).orderBy(asc(traceSources.id)).all();
}

/** Rooms and storage units in use (not retired), in site, room and unit order. */
export function locationRows(db: DbOrTx, scope: ExportScope) {
  const roomRows = db
    .select({
      id: rooms.id,
      siteName: sites.name,
      code: rooms.code,
      name: rooms.name,
      kind: rooms.kind,
      floorAreaM2: rooms.floorAreaM2,
      heightM: rooms.heightM,
      airChangesPerHour: rooms.airChangesPerHour,
      mixingFactor: rooms.mixingFactor,
      designMaxTempC: rooms.designMaxTempC,
      sprinklered: rooms.sprinklered,
      setMinC: rooms.setMinC,
      setMaxC: rooms.setMaxC,
      excursionThresholdC: rooms.excursionThresholdC,
      excursionMinDurationMin: rooms.excursionMinDurationMin,
    })
    .from(rooms)
    .innerJoin(sites, eq(sites.id, rooms.siteId))
    .where(and(isNull(rooms.retiredAt), isNull(sites.retiredAt), scope.siteId ? eq(rooms.siteId, scope.siteId) : undefined))
    .orderBy(asc(sites.name), asc(rooms.code))
    .all();
  const unitRows = roomRows.length
    ? db
        .select({
          id: storageUnits.id,
          roomId: storageUnits.roomId,
          code: storageUnits.code,
          name: storageUnits.name,
          kind: storageUnits.kind,
          internalVolumeL: storageUnits.internalVolumeL,
          setMinC: storageUnits.setMinC,
          setMaxC: storageUnits.setMaxC,
          excursionThresholdC: storageUnits.excursionThresholdC,
          excursionMinDurationMin: storageUnits.excursionMinDurationMin,
          ventilated: storageUnits.ventilated,
          ignitionSourceFree: storageUnits.ignitionSourceFree,
        })
        .from(storageUnits)
        .innerJoin(rooms, eq(rooms.id, storageUnits.roomId))
        .innerJoin(sites, eq(sites.id, rooms.siteId))
        .where(and(isNull(storageUnits.retiredAt), isNull(rooms.retiredAt), isNull(sites.retiredAt), scope.siteId ? eq(rooms.siteId, scope.siteId) : undefined))
        .orderBy(asc(storageUnits.roomId), asc(storageUnits.code))
        .all()
    : [];
  const unitsByRoom = new Map<number, typeof unitRows>();
  for (const unit of unitRows) {
    const list = unitsByRoom.get(unit.roomId) ?? [];
    list.push(unit);
    unitsByRoom.set(unit.roomId, list);
  }
  return roomRows.map((room) => ({ ...room, units: unitsByRoom.get(room.id) ?? [] }));
}
export type LocationExportRoom = ReturnType<typeof locationRows>[number];

const unitRoom = alias(rooms, "unit_room");
const excursionSiteId = sql<number | null>`coalesce(${rooms.siteId}, ${unitRoom.siteId})`;

export function excursionPage(db: DbOrTx, scope: ExportScope, afterId: number, limit: number) {
  const lastReadingAtMs = sql<number | null>`(select max(${readings.at}) from ${readings} where ${readings.sensorId} = ${excursions.sensorId})`;
  return db
    .select({
      id: excursions.id,
      sensorExternalId: sensors.externalId,
      sensorName: sensors.name,
      siteName: sites.name,
      roomCode: sql<string | null>`coalesce(${rooms.code}, ${unitRoom.code})`,
      unitCode: storageUnits.code,
      thresholdC: excursions.thresholdC,
      startAt: excursions.startAt,
      endAt: excursions.endAt,
      peakTempC: excursions.peakTempC,
      peakAt: excursions.peakAt,
      lastReadingAtMs,
      acknowledgedAt: excursions.acknowledgedAt,
      acknowledgedByName: users.name,
      acknowledgeComment: excursions.acknowledgeComment,
    })
    .from(excursions)
    .innerJoin(sensors, eq(sensors.id, excursions.sensorId))
    .leftJoin(rooms, eq(rooms.id, excursions.roomId))
    .leftJoin(storageUnits, eq(storageUnits.id, excursions.storageUnitId))
    .leftJoin(unitRoom, eq(unitRoom.id, storageUnits.roomId))
    .leftJoin(sites, eq(sites.id, excursionSiteId))
    .leftJoin(users, eq(users.id, excursions.acknowledgedById))
    .where(and(gt(excursions.id, afterId), scope.siteId ? sql`${excursionSiteId} = ${scope.siteId}` : undefined))
    .orderBy(asc(excursions.id))
    .limit(limit)
    .all();
}
export type ExcursionExportRow = ReturnType<typeof excursionPage>[number];

/**
 * The substances the scope's numbers rest on: those held in its containers (directly or in a
 * mixture) and those its findings name (directly or through a mixture), with their exposure limits.
 */
export function substancesInScope(db: DbOrTx, scope: ExportScope) {
  const site = scope.siteId ?? null;
  const ids = db
    .all<{ id: number }>(
      sql`select c.substance_id as id from containers c
            join storage_units u on u.id = c.storage_unit_id join rooms r on r.id = u.room_id
            where c.state <> 'disposed' and c.substance_id is not null and (${site} is null or r.site_id = ${site})
          union
          select mc.substance_id from mixture_components mc
            join containers c on c.mixture_id = mc.mixture_id
            join storage_units u on u.id = c.storage_unit_id join rooms r on r.id = u.room_id
            where c.state <> 'disposed' and (${site} is null or r.site_id = ${site})
          union
          select f.substance_id from findings f left join rooms r on r.id = f.room_id
            where f.substance_id is not null and (${site} is null or coalesce(f.site_id, r.site_id) = ${site})
          union
          select mc.substance_id from mixture_components mc
            join findings f on f.mixture_id = mc.mixture_id left join rooms r on r.id = f.room_id
            where (${site} is null or coalesce(f.site_id, r.site_id) = ${site})`,
    )
    .map((r) => r.id);
  if (ids.length === 0) return [];
  const rows = db.select().from(substances).where(inArray(substances.id, ids)).orderBy(asc(substances.name), asc(substances.id)).all();
  const limits = db.select().from(exposureLimits).where(inArray(exposureLimits.substanceId, ids)).orderBy(asc(exposureLimits.id)).all();
  return rows.map((row) => ({ ...row, exposureLimits: limits.filter((l) => l.substanceId === row.id) }));
}
export type SubstanceExportRow = ReturnType<typeof substancesInScope>[number];

export type RegisterCounts = {
  findings: { severity: Severity; status: FindingStatus; n: number }[];
  containersInStorage: number;
  rooms: number;
  storageUnits: number;
  openExcursions: number;
};

export function registerCounts(db: DbOrTx, scope: ExportScope): RegisterCounts {
  const bySeverityStatus = db
    .select({ severity: findings.severity, status: findings.status, n: count() })
    .from(findings)
    .leftJoin(rooms, eq(rooms.id, findings.roomId))
    .where(findingInScope(scope))
    .groupBy(findings.severity, findings.status)
    .all();
  const siteOfRoom = scope.siteId ? eq(rooms.siteId, scope.siteId) : undefined;
  const containersInStorage =
    db
      .select({ n: count() })
      .from(containers)
      .innerJoin(storageUnits, eq(storageUnits.id, containers.storageUnitId))
      .innerJoin(rooms, eq(rooms.id, storageUnits.roomId))
      .where(and(ne(containers.state, "disposed"), siteOfRoom))
      .get()?.n ?? 0;
  const roomCount =
    db
      .select({ n: count() })
      .from(rooms)
      .innerJoin(sites, eq(sites.id, rooms.siteId))
      .where(and(isNull(rooms.retiredAt), isNull(sites.retiredAt), siteOfRoom))
      .get()?.n ?? 0;
  const unitCount =
    db
      .select({ n: count() })
      .from(storageUnits)
      .innerJoin(rooms, eq(rooms.id, storageUnits.roomId))
      .innerJoin(sites, eq(sites.id, rooms.siteId))
      .where(and(isNull(storageUnits.retiredAt), isNull(rooms.retiredAt), isNull(sites.retiredAt), siteOfRoom))
      .get()?.n ?? 0;
  const openExcursions =
    db
      .select({ n: count() })
      .from(excursions)
      .leftJoin(rooms, eq(rooms.id, excursions.roomId))
      .leftJoin(storageUnits, eq(storageUnits.id, excursions.storageUnitId))
      .leftJoin(unitRoom, eq(unitRoom.id, storageUnits.roomId))
      .where(and(isNull(excursions.endAt), scope.siteId ? sql`${excursionSiteId} = ${scope.siteId}` : undefined))
      .get()?.n ?? 0;
  return { findings: bySeverityStatus, containersInStorage, rooms: roomCount, storageUnits: unitCount, openExcursions };
}

/** Every stored setting and quantity limit, for the methods sheet. */
export function settingsInForce(db: DbOrTx) {
  return {
    settings: db.select({ key: settings.key, value: settings.value }).from(settings).orderBy(asc(settings.key)).all(),
    quantityLimits: db.select().from(quantityLimits).orderBy(asc(quantityLimits.scope), asc(quantityLimits.id)).all(),
  };
}
