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
  /** Control-lost findings: minutes after a failure at which the finding's severity is reached, its threshold and temperature. */
  timeToDangerMin: number | null;
  timeToDangerThreshold: string | null;
  timeToDangerTempC: number | null;
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
 * The pages of the three long tables, as prepared statements run straight on better-sqlite3 in
 * raw mode (rows as arrays), each row turned into an object by a literal mapping: for 100,000
 * findings the query builder's row mapping costs as much again as SQLite itself, and
 * better-sqlite3's own row objects twice as much as arrays. Each mapping lists the fields in the
 * statement's select order (tests/integration/register-export.test.ts checks the pairs).
 * Timestamps stay epoch ms (the workbook writes them as dates). `@site` null means every site.
 */
const FINDING_SELECT = `f.id, f.severity, f.status, f.rule, f.scenario, f.title, s.name, r.code, u.code,
            c.label, sub.name, sub.cas, m.name,
            f.value, f.limit_value, f.ratio, f.unit, f.worst_case_temp_c,
            f.worst_case_source, f.first_raised_at,
            case when f.condition_holds and r.assessed_at > f.last_evaluated_at then r.assessed_at else f.last_evaluated_at end,
            f.resolved_at, a.name, f.mitigation_plan,
            f.risk_accepted_until, f.fingerprint, f.time_to_danger_min, f.time_to_danger_threshold, f.time_to_danger_temp_c`;

/** A row of FINDING_SELECT. */
export function findingExportRow(r: unknown[]): FindingExportRow {
  return {
    id: r[0],
    severity: r[1],
    status: r[2],
    rule: r[3],
    scenario: r[4],
    title: r[5],
    siteName: r[6],
    roomCode: r[7],
    unitCode: r[8],
    containerLabel: r[9],
    substanceName: r[10],
    cas: r[11],
    mixtureName: r[12],
    value: r[13],
    limitValue: r[14],
    ratio: r[15],
    unit: r[16],
    worstCaseTempC: r[17],
    worstCaseSource: r[18],
    firstRaisedAt: r[19],
    lastEvaluatedAt: r[20],
    resolvedAt: r[21],
    assigneeName: r[22],
    mitigationPlan: r[23],
    riskAcceptedUntil: r[24],
    fingerprint: r[25],
    timeToDangerMin: r[26],
    timeToDangerThreshold: r[27],
    timeToDangerTempC: r[28],
  } as FindingExportRow;
}

/** `text` is a Buffer of its UTF-8 bytes when it is known to be XML-safe (the workbook copies those bytes). */
export type TraceExportRow = { id: number; title: string; text: string | Buffer | null; sourceIds: string | null; traceJson: string | null };

// The readable text when it was rendered with the trace (as a blob, its bytes, when it is XML-safe);
// the JSON only for a trace stored before.
const TRACE_SELECT = "f.id, f.title, case when t.text_xml_safe then cast(t.text as blob) else t.text end, t.source_ids, case when t.text is null then t.trace end";

/** A row of TRACE_SELECT. */
export function traceExportRow(r: unknown[]): TraceExportRow {
  return { id: r[0], title: r[1], text: r[2], sourceIds: r[3], traceJson: r[4] } as TraceExportRow;
}

const CONTAINER_SELECT = `c.id, c.label, sub.name, sub.cas, m.name, c.amount, c.amount_unit,
            c.capacity, c.capacity_unit, c.container_kind, c.state, s.name,
            r.code, u.code, o.name, c.received_at, c.opened_at,
            c.expires_at, c.notes`;

/** A row of CONTAINER_SELECT. */
export function containerExportRow(r: unknown[]): ContainerExportRow {
  return {
    id: r[0],
    label: r[1],
    substanceName: r[2],
    cas: r[3],
    mixtureName: r[4],
    amount: r[5],
    amountUnit: r[6],
    capacity: r[7],
    capacityUnit: r[8],
    containerKind: r[9],
    state: r[10],
    siteName: r[11],
    roomCode: r[12],
    unitCode: r[13],
    ownerName: r[14],
    receivedAt: r[15],
    openedAt: r[16],
    expiresAt: r[17],
    notes: r[18],
  } as ContainerExportRow;
}

/** The select lists above with their row mappings, for the test that checks they line up. */
export const EXPORT_SELECTS = [
  { select: FINDING_SELECT, toRow: findingExportRow },
  { select: TRACE_SELECT, toRow: traceExportRow },
  { select: CONTAINER_SELECT, toRow: containerExportRow },
] as const;

export function exportPageQueries(db: Db) {
  const sqlite = db.$client;
  const findingStatement = sqlite
    .prepare(
      `select ${FINDING_SELECT}
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
    )
    .raw(true);
  const traceStatement = sqlite
    .prepare(
      `select ${TRACE_SELECT}
         from findings f
         join finding_traces t on t.finding_id = f.id
         left join rooms r on r.id = f.room_id
        where f.id > @after and (@site is null or coalesce(f.site_id, r.site_id) = @site)
        order by f.id limit @limit`,
    )
    .raw(true);
  const containerStatement = sqlite
    .prepare(
      `select ${CONTAINER_SELECT}
         from containers c
         join storage_units u on u.id = c.storage_unit_id
         join rooms r on r.id = u.room_id
         join sites s on s.id = r.site_id
         left join substances sub on sub.id = c.substance_id
         left join mixtures m on m.id = c.mixture_id
         left join users o on o.id = c.owner_id
        where c.id > @after and c.state <> 'disposed' and (@site is null or r.site_id = @site)
        order by c.id limit @limit`,
    )
    .raw(true);
  const page = <T>(statement: typeof findingStatement, toRow: (r: unknown[]) => T, scope: ExportScope, after: number, limit: number): T[] =>
    (statement.all({ after, limit, site: scope.siteId ?? null }) as unknown[][]).map(toRow);
  return {
    findings: (scope: ExportScope, after: number, limit: number) => page(findingStatement, findingExportRow, scope, after, limit),
    /** Findings' traces as their stored readable text (or, for an older trace, its JSON), and the ids of the sources cited. */
    traces: (scope: ExportScope, after: number, limit: number) => page(traceStatement, traceExportRow, scope, after, limit),
    containers: (scope: ExportScope, after: number, limit: number) => page(containerStatement, containerExportRow, scope, after, limit),
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
  // Unscoped, the room joins only cost time (every container has a unit and a room): the findings'
  // substances come from the substance index alone.
  const ids = db
    .all<{ id: number }>(
      site === null
        ? sql`select c.substance_id as id from containers c where c.state <> 'disposed' and c.substance_id is not null
              union
              select mc.substance_id from mixture_components mc join containers c on c.mixture_id = mc.mixture_id
                where c.state <> 'disposed'
              union
              select f.substance_id from findings f where f.substance_id is not null
              union
              select mc.substance_id from mixture_components mc
                where mc.mixture_id in (select f.mixture_id from findings f where f.mixture_id is not null)`
        : sql`select c.substance_id as id from containers c
            join storage_units u on u.id = c.storage_unit_id join rooms r on r.id = u.room_id
            where c.state <> 'disposed' and c.substance_id is not null and r.site_id = ${site}
          union
          select mc.substance_id from mixture_components mc
            join containers c on c.mixture_id = mc.mixture_id
            join storage_units u on u.id = c.storage_unit_id join rooms r on r.id = u.room_id
            where c.state <> 'disposed' and r.site_id = ${site}
          union
          select f.substance_id from findings f left join rooms r on r.id = f.room_id
            where f.substance_id is not null and coalesce(f.site_id, r.site_id) = ${site}
          union
          select mc.substance_id from mixture_components mc
            join findings f on f.mixture_id = mc.mixture_id left join rooms r on r.id = f.room_id
            where coalesce(f.site_id, r.site_id) = ${site}`,
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
  const countsBy = { severity: findings.severity, status: findings.status, n: count() };
  // Unscoped, the counts come from the (status, severity) index alone; the room join would read every finding.
  const bySeverityStatus = scope.siteId
    ? db.select(countsBy).from(findings).leftJoin(rooms, eq(rooms.id, findings.roomId)).where(findingInScope(scope)).groupBy(findings.severity, findings.status).all()
    : db.select(countsBy).from(findings).groupBy(findings.severity, findings.status).all();
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
