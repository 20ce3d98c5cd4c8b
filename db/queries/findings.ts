import "server-only";
import { and, asc, count, desc, eq, inArray, isNull, or, sql as rawSql, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import { getDb } from "@/db/client";
import { containers, findingEvents, findings, findingTraces, mixtures, rooms, sites, storageUnits, substances, users, type Severity } from "@/db/schema";
import type { FindingListQuery } from "@/lib/register/schemas";
import { groupFindings, type FindingLine } from "@/lib/register/grouping";
import { lastAssessedAt } from "@/lib/register/store";
import type { Scope } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session";

/**
 * Which findings a user may see. "own" means: for a researcher, the findings their containers
 * contribute to (the one a finding records, and every other by `contributedBy`: a small bottle
 * beside a neighbour's large one adds to the same vapor) and those of the units they own; for
 * facilities staff, the rooms they are the contact for and the units they own.
 */
export function findingsVisibleTo(user: SessionUser, scope: Scope): SQL | undefined {
  return visibleTo(user, scope, contributedBy);
}

/** `contributed(condition, key)`: the findings the containers picked by `condition` contribute to; `key` names those containers. */
type Contributed = (containerCondition: SQL, key: string) => SQL;

function visibleTo(user: SessionUser, scope: Scope, contributed: Contributed): SQL | undefined {
  if (scope === "all") return undefined;
  const db = getDb();
  if (user.role === "researcher") {
    return or(
      inArray(findings.containerId, db.select({ id: containers.id }).from(containers).where(eq(containers.ownerId, user.id))),
      inArray(findings.storageUnitId, db.select({ id: storageUnits.id }).from(storageUnits).where(eq(storageUnits.ownerId, user.id))),
      contributed(rawSql`c.owner_id = ${user.id}`, `owner ${user.id}`),
    );
  }
  return or(
    inArray(findings.roomId, db.select({ id: rooms.id }).from(rooms).where(eq(rooms.facilitiesContactId, user.id))),
    inArray(findings.storageUnitId, db.select({ id: storageUnits.id }).from(storageUnits).where(eq(storageUnits.ownerId, user.id))),
  );
}

// ---------------------------------------------------------------------------------------------
// The register list and one finding
// ---------------------------------------------------------------------------------------------


const SEVERITY_ORDER = rawSql`case ${findings.severity} when 'critical' then 4 when 'high' then 3 when 'moderate' then 2 else 1 end`;
const STATUS_ORDER = rawSql`case ${findings.status} when 'open' then 1 when 'acknowledged' then 2 when 'mitigating' then 3 when 'risk_accepted' then 4 else 5 end`;

export type FindingListRow = {
  id: number;
  /** rule | location | subject | scenario: the findings of one problem share all but the scenario. */
  fingerprint: string;
  rule: string;
  severity: Severity;
  status: string;
  scenario: string;
  title: string;
  value: number | null;
  limit: number | null;
  ratio: number | null;
  unit: string | null;
  worstCaseTempC: number | null;
  worstCaseSource: string | null;
  /** Control-lost findings: minutes after a failure at which the finding's severity is reached (see db/schema.ts findings). */
  timeToDanger: { minutes: number; threshold: string; tempC: number } | null;
  firstRaisedAt: Date;
  updatedAt: Date;
  location: { siteId: number | null; siteName: string | null; roomId: number | null; roomCode: string | null; storageUnitId: number | null; unitCode: string | null; label: string };
  substance: { id: number; name: string; cas: string | null } | null;
  mixture: { id: number; name: string } | null;
  containerId: number | null;
  assignee: { id: number; name: string } | null;
};

/**
 * The findings a container contributes to, for the containers `containerCondition` picks (a SQL
 * condition on the alias `c`): the findings that turn on it; those of its unit, and of its room's
 * own rules (spills, the room's worst case), about its substance or mixture; its unit's
 * "open containers together" while it is open, and its unit's or room's quantity limits; its room's
 * oxygen and CO₂ findings when it holds a cryogen or dry ice. Empty and disposed containers
 * contribute nothing.
 */
function contributedBy(containerCondition: SQL): SQL {
  return rawSql`${findings.id} in (${contributedIds(containerCondition)})`;
}

/**
 * contributedBy read once, as a list of ids: the statements of one register call (counts, lines,
 * the lines' findings) then share one reading instead of each repeating it — for a person with
 * hundreds of containers it reads thousands of findings rows.
 */
function contributedByOnce(): Contributed {
  const read = new Map<string, SQL>();
  return (containerCondition, key) => {
    let condition = read.get(key);
    if (!condition) {
      const ids = getDb()
        .all<{ id: number }>(contributedIds(containerCondition))
        .map((row) => row.id);
      condition = rawSql`${findings.id} in (select value from json_each(${JSON.stringify(ids)}))`;
      read.set(key, condition);
    }
    return condition;
  };
}

/** The ids of the findings the containers `containerCondition` picks contribute to (see contributedBy). */
function contributedIds(containerCondition: SQL): SQL {
  // From the containers to the findings, by the findings' indexes (unit; room and unit): never a
  // check of every finding against every container, which for a person with thousands of
  // containers and a register of 100,000 findings would take minutes. Each unit's (and room's)
  // findings are read once, then matched against that place's containers: a unit holding a
  // person's bottles of several substances is not read once per substance.
  const matches = rawSql.raw(`(f2.substance_id = mine.substance_id
      or f2.mixture_id = mine.mixture_id
      or (f2.rule = 'enclosure-lfl' and f2.substance_id is null and f2.mixture_id is null and mine.is_open)
      or f2.rule = 'quantity-limit'
      or (f2.rule in ('oxygen-depletion', 'co2-exposure') and mine.physical_state in ('cryogen', 'solid')))`);
  return rawSql`
    with mine as (
      select distinct c.storage_unit_id, cu.room_id, c.substance_id, c.mixture_id, c.state in ('opened', 'in_use') as is_open, cs.physical_state
      from containers c
      join storage_units cu on cu.id = c.storage_unit_id
      left join substances cs on cs.id = c.substance_id
      where ${containerCondition} and c.state not in ('empty', 'disposed')
    )
    select f2.id from (select distinct storage_unit_id from mine) here cross join findings f2 on f2.storage_unit_id = here.storage_unit_id
      where exists (select 1 from mine where mine.storage_unit_id = f2.storage_unit_id and ${matches})
    union
    select f2.id from (select distinct room_id from mine) here cross join findings f2 on f2.room_id = here.room_id and f2.storage_unit_id is null
      where exists (select 1 from mine where mine.room_id = f2.room_id and ${matches})
    union
    select f2.id from containers c cross join findings f2 on f2.container_id = c.id where ${containerCondition} and c.state not in ('empty', 'disposed')`;
}

/**
 * How the statuses are matched: "index" lets SQLite use the (status, severity) index — right for
 * counts, which it answers from the index alone; "scan" keeps it from that index — right for a
 * statement that reads most findings' rows anyway: the default views hold about two thirds of the
 * register, and reading those rows in the index's order, one by one, costs far more than reading
 * the table through.
 */
type StatusMatch = "index" | "scan";

/**
 * How a count matches the statuses: from the (status, severity) index alone when nothing else
 * narrows it (the whole register by status); otherwise "scan", so that SQLite starts from a
 * narrower index (room, unit) or reads the table through rather than look up most findings' rows
 * one by one from the status index to test the rest (a search, a scope, mine=true).
 */
function countStatusMatch(scope: Scope, query: Partial<FindingListQuery>): StatusMatch {
  const narrowed = query.scenario?.length || query.siteId || query.roomId || query.storageUnitId || query.containerId || query.substanceId || query.mine || query.rule || query.q;
  return scope === "all" && !narrowed ? "index" : "scan";
}

function findingFilters(
  user: SessionUser,
  scope: Scope,
  query: Partial<FindingListQuery>,
  statusMatch: StatusMatch = "index",
  contributed: Contributed = contributedByOnce(),
): SQL | undefined {
  const like = (q: string) => `%${q.toLowerCase().replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
  return and(
    visibleTo(user, scope, contributed),
    query.severity?.length ? inArray(findings.severity, query.severity) : undefined,
    query.status?.length ? (statusMatch === "scan" ? inArray(rawSql`+${findings.status}`, query.status) : inArray(findings.status, query.status)) : undefined,
    query.scenario?.length ? inArray(findings.scenario, query.scenario) : undefined,
    query.siteId ? eq(findings.siteId, query.siteId) : undefined,
    // A unit's findings carry its room too: a room's filter includes its units' findings.
    query.roomId ? eq(findings.roomId, query.roomId) : undefined,
    query.storageUnitId ? eq(findings.storageUnitId, query.storageUnitId) : undefined,
    query.containerId ? contributed(rawSql`c.id = ${query.containerId}`, `container ${query.containerId}`) : undefined,
    query.substanceId
      ? or(
          eq(findings.substanceId, query.substanceId),
          inArray(findings.mixtureId, rawSql`(select mixture_id from mixture_components where substance_id = ${query.substanceId})`),
        )
      : undefined,
    query.mine ? contributed(rawSql`c.owner_id = ${user.id}`, `owner ${user.id}`) : undefined,
    query.rule ? eq(findings.rule, query.rule) : undefined,
    query.q
      ? or(
          rawSql`lower(${findings.title}) like ${like(query.q)} escape '\\'`,
          // A room's code finds its units' findings as well (they carry the room).
          inArray(findings.roomId, rawSql`(select id from rooms where lower(code) like ${like(query.q)} escape '\\')`),
          inArray(findings.storageUnitId, rawSql`(select id from storage_units where lower(code) like ${like(query.q)} escape '\\')`),
        )
      : undefined,
  );
}

function readListRows(where: SQL | undefined, order: SQL[], paging?: { limit: number; offset: number }): FindingListRow[] {
  const db = getDb();
  const assignee = alias(users, "assignee");
  const query = db
    .select({
      id: findings.id,
      fingerprint: findings.fingerprint,
      rule: findings.rule,
      severity: findings.severity,
      status: findings.status,
      scenario: findings.scenario,
      title: findings.title,
      value: findings.value,
      limit: findings.limitValue,
      ratio: findings.ratio,
      unit: findings.unit,
      worstCaseTempC: findings.worstCaseTempC,
      worstCaseSource: findings.worstCaseSource,
      timeToDangerMin: findings.timeToDangerMin,
      timeToDangerThreshold: findings.timeToDangerThreshold,
      timeToDangerTempC: findings.timeToDangerTempC,
      firstRaisedAt: findings.firstRaisedAt,
      updatedAt: findings.updatedAt,
      siteId: findings.siteId,
      siteName: sites.name,
      roomId: findings.roomId,
      roomCode: rooms.code,
      storageUnitId: findings.storageUnitId,
      unitCode: storageUnits.code,
      substanceId: substances.id,
      substanceName: substances.name,
      cas: substances.cas,
      mixtureId: mixtures.id,
      mixtureName: mixtures.name,
      containerId: findings.containerId,
      assigneeId: assignee.id,
      assigneeName: assignee.name,
    })
    .from(findings)
    .leftJoin(sites, eq(sites.id, findings.siteId))
    .leftJoin(rooms, eq(rooms.id, findings.roomId))
    .leftJoin(storageUnits, eq(storageUnits.id, findings.storageUnitId))
    .leftJoin(substances, eq(substances.id, findings.substanceId))
    .leftJoin(mixtures, eq(mixtures.id, findings.mixtureId))
    .leftJoin(assignee, eq(assignee.id, findings.assigneeId))
    .where(where)
    .orderBy(...order, asc(findings.id));
  const rows = paging ? query.limit(paging.limit).offset(paging.offset).all() : query.all();
  return rows.map((r) => ({
      id: r.id,
      fingerprint: r.fingerprint,
      rule: r.rule,
      severity: r.severity,
      status: r.status,
      scenario: r.scenario,
      title: r.title,
      value: r.value,
      limit: r.limit,
      ratio: r.ratio,
      unit: r.unit,
      worstCaseTempC: r.worstCaseTempC,
      worstCaseSource: r.worstCaseSource,
      timeToDanger:
        r.timeToDangerMin == null ? null : { minutes: r.timeToDangerMin, threshold: r.timeToDangerThreshold ?? "", tempC: r.timeToDangerTempC ?? 0 },
      firstRaisedAt: r.firstRaisedAt,
      updatedAt: r.updatedAt,
      location: {
        siteId: r.siteId,
        siteName: r.siteName,
        roomId: r.roomId,
        roomCode: r.roomCode,
        storageUnitId: r.storageUnitId,
        unitCode: r.unitCode,
        label: [r.roomCode, r.unitCode].filter(Boolean).join(" › ") || "—",
      },
      substance: r.substanceId ? { id: r.substanceId, name: r.substanceName!, cas: r.cas } : null,
      mixture: r.mixtureId ? { id: r.mixtureId, name: r.mixtureName! } : null,
      containerId: r.containerId,
      assignee: r.assigneeId ? { id: r.assigneeId, name: r.assigneeName! } : null,
  }));
}

export function listFindingsPage(user: SessionUser, scope: Scope, query: FindingListQuery): { rows: FindingListRow[]; total: number } {
  const contributed = contributedByOnce();
  const where = findingFilters(user, scope, query, "scan", contributed);
  const dir = query.dir === "desc" ? desc : asc;
  const order: SQL[] = {
    severity: [dir(SEVERITY_ORDER), desc(findings.ratio)],
    status: [dir(STATUS_ORDER), desc(SEVERITY_ORDER)],
    rule: [dir(findings.rule), desc(SEVERITY_ORDER)],
    location: [dir(rooms.code), dir(storageUnits.code)],
    ratio: [rawSql`${findings.ratio} ${rawSql.raw(query.dir)} nulls last`],
    worstCaseTempC: [rawSql`${findings.worstCaseTempC} ${rawSql.raw(query.dir)} nulls last`],
    // Soonest first by default ("asc"); findings without a time to danger last either way.
    timeToDanger: [rawSql`${findings.timeToDangerMin} ${rawSql.raw(query.dir)} nulls last`, desc(SEVERITY_ORDER)],
    age: [query.dir === "desc" ? asc(findings.firstRaisedAt) : desc(findings.firstRaisedAt)],
    updated: [dir(findings.updatedAt)],
  }[query.sort].map((o) => o as SQL);
  const total = getDb().select({ n: count() }).from(findings).where(findingFilters(user, scope, query, countStatusMatch(scope, query), contributed)).get()?.n ?? 0;
  return { total, rows: readListRows(where, order, { limit: query.pageSize, offset: (query.page - 1) * query.pageSize }) };
}

/** rule | location | subject: the fingerprint without its scenario (as `findingGroupKey` in lib/register/grouping.ts). */
const GROUP_KEY = rawSql<string>`substr(${findings.fingerprint}, 1, length(${findings.fingerprint}) - length(${findings.scenario}) - 1)`;

/**
 * One line per problem, a page of lines at a time: the lines are paged in SQL (worst first, or by
 * location), then every finding of the page's lines is read and arranged by `groupFindings`.
 * `total` counts lines, `findings` the findings within them.
 */
export function listFindingLinesPage(
  user: SessionUser,
  scope: Scope,
  query: FindingListQuery,
): { lines: FindingLine<FindingListRow>[]; total: number; findings: number } {
  const db = getDb();
  const where = findingFilters(user, scope, query, "scan");
  const worst = rawSql<number>`max(${SEVERITY_ORDER})`;
  const maxRatio = rawSql<number | null>`max(${findings.ratio})`;
  const up = query.dir === "asc";
  const order: SQL[] =
    query.sort === "location"
      ? [rawSql`min(${rooms.code}) ${rawSql.raw(up ? "asc" : "desc")}`, rawSql`min(coalesce(${storageUnits.code}, '')) ${rawSql.raw(up ? "asc" : "desc")}`, desc(worst)]
      : query.sort === "ratio"
        ? [rawSql`${maxRatio} ${rawSql.raw(up ? "asc" : "desc")} nulls last`, desc(worst)]
        : query.sort === "timeToDanger"
          ? [rawSql`min(${findings.timeToDangerMin}) ${rawSql.raw(up ? "asc" : "desc")} nulls last`, desc(worst)]
        : [up ? asc(worst) : desc(worst), rawSql`${maxRatio} ${rawSql.raw(up ? "asc" : "desc")} nulls last`];
  // One pass over the filtered findings: the page's lines with their findings' ids, and the totals
  // (window functions run before LIMIT). The findings are then read by id.
  const page = db
    .select({
      key: GROUP_KEY,
      ids: rawSql<string>`json_group_array(${findings.id})`,
      lines: rawSql<number>`count(*) over ()`,
      findings: rawSql<number>`sum(count(*)) over ()`,
    })
    .from(findings)
    .leftJoin(rooms, eq(rooms.id, findings.roomId))
    .leftJoin(storageUnits, eq(storageUnits.id, findings.storageUnitId))
    .where(where)
    .groupBy(GROUP_KEY)
    .orderBy(...order, asc(GROUP_KEY))
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize)
    .all();
  // A page past the last has no rows to carry the totals.
  const totals =
    page.length > 0
      ? { lines: page[0].lines, findings: page[0].findings }
      : query.page > 1
        ? db.select({ lines: rawSql<number>`count(distinct ${GROUP_KEY})`, findings: count() }).from(findings).where(where).get()
        : { lines: 0, findings: 0 };
  const rank = new Map(page.map((line, i) => [line.key, i]));
  const ids = page.flatMap((line) => JSON.parse(line.ids) as number[]);
  const rows = ids.length ? readListRows(rawSql`${findings.id} in (select value from json_each(${JSON.stringify(ids)}))`, [desc(SEVERITY_ORDER)]) : [];
  const lines = groupFindings(rows).sort((a, b) => rank.get(a.key)! - rank.get(b.key)!);
  return { lines, total: totals?.lines ?? 0, findings: totals?.findings ?? 0 };
}

export type LocationSummary = {
  roomId: number;
  roomCode: string;
  roomName: string;
  storageUnitId: number | null;
  unitCode: string | null;
  unitName: string | null;
  label: string;
  worst: Severity;
  counts: Record<Severity, number>;
  total: number;
  /** The location's worst finding. */
  top: { id: number; title: string; severity: Severity };
};

const SEVERITY_OF_RANK: Record<number, Severity> = { 4: "critical", 3: "high", 2: "moderate", 1: "low" };

/**
 * The register by location: every room (its own findings) and every storage unit with findings in
 * the filters, worst first, with its counts per severity and its worst finding. The counts of all
 * locations add up to the findings in the filters (each finding has one room and at most one unit).
 */
export function listFindingLocations(user: SessionUser, scope: Scope, query: Partial<FindingListQuery>): LocationSummary[] {
  const where = findingFilters(user, scope, query, "scan");
  // "+" keeps SQLite from walking the (room, unit) index to group: that reads every finding's row
  // in the index's order, one by one; reading the table through and sorting costs far less.
  const roomId = rawSql<number | null>`+${findings.roomId}`;
  const storageUnitId = rawSql<number | null>`+${findings.storageUnitId}`;
  const bySeverity = (severity: Severity) => rawSql<number>`sum(case when ${findings.severity} = ${severity} then 1 else 0 end)`;
  const ranked = getDb()
    .select({
      id: findings.id,
      roomId: findings.roomId,
      storageUnitId: findings.storageUnitId,
      title: findings.title,
      severity: findings.severity,
      place: rawSql<number>`row_number() over (partition by ${roomId}, ${storageUnitId} order by ${SEVERITY_ORDER} desc, ${findings.ratio} desc nulls last, ${findings.id})`.as("place"),
    })
    .from(findings)
    .where(where)
    .as("ranked");
  const tops = new Map(
    getDb()
      .select({ id: ranked.id, roomId: ranked.roomId, storageUnitId: ranked.storageUnitId, title: ranked.title, severity: ranked.severity })
      .from(ranked)
      .where(eq(ranked.place, 1))
      .all()
      .map((t) => [`${t.roomId}|${t.storageUnitId ?? ""}`, t]),
  );
  const rows = getDb()
    .select({
      roomId: findings.roomId,
      storageUnitId: findings.storageUnitId,
      roomCode: rooms.code,
      roomName: rooms.name,
      unitCode: storageUnits.code,
      unitName: storageUnits.name,
      worst: rawSql<number>`max(${SEVERITY_ORDER})`,
      critical: bySeverity("critical"),
      high: bySeverity("high"),
      moderate: bySeverity("moderate"),
      low: bySeverity("low"),
      total: count(),
    })
    .from(findings)
    .innerJoin(rooms, eq(rooms.id, roomId))
    .leftJoin(storageUnits, eq(storageUnits.id, findings.storageUnitId))
    .where(where)
    .groupBy(roomId, storageUnitId)
    .orderBy(desc(rawSql`max(${SEVERITY_ORDER})`), desc(bySeverity("critical")), desc(bySeverity("high")), desc(count()), asc(rooms.code), asc(storageUnits.code))
    .all();
  return rows.map((r) => {
    const top = tops.get(`${r.roomId}|${r.storageUnitId ?? ""}`)!;
    return {
      roomId: r.roomId!,
      roomCode: r.roomCode,
      roomName: r.roomName,
      storageUnitId: r.storageUnitId,
      unitCode: r.unitCode,
      unitName: r.unitName,
      label: r.unitCode ? `${r.roomCode} › ${r.unitCode}` : r.roomCode,
      worst: SEVERITY_OF_RANK[Number(r.worst)],
      counts: { critical: Number(r.critical), high: Number(r.high), moderate: Number(r.moderate), low: Number(r.low) },
      total: r.total,
      top: { id: top.id, title: top.title, severity: top.severity },
    };
  });
}

/** The findings of some locations, as lines per location ("room:1" for a room's own findings, "unit:5"). */
export function findingLinesAt(user: SessionUser, scope: Scope, query: Partial<FindingListQuery>, locations: { roomId: number; storageUnitId: number | null }[]): Map<string, FindingLine<FindingListRow>[]> {
  const result = new Map<string, FindingLine<FindingListRow>[]>();
  if (locations.length === 0) return result;
  const unitIds = locations.flatMap((l) => (l.storageUnitId !== null ? [l.storageUnitId] : []));
  const roomIds = locations.flatMap((l) => (l.storageUnitId === null ? [l.roomId] : []));
  const where = and(
    findingFilters(user, scope, query),
    or(
      unitIds.length ? inArray(findings.storageUnitId, unitIds) : undefined,
      roomIds.length ? and(inArray(findings.roomId, roomIds), isNull(findings.storageUnitId)) : undefined,
    ),
  );
  const rows = readListRows(where, [desc(SEVERITY_ORDER)]);
  const byLocation = new Map<string, FindingListRow[]>();
  for (const row of rows) {
    const key = row.location.storageUnitId !== null ? `unit:${row.location.storageUnitId}` : `room:${row.location.roomId}`;
    byLocation.set(key, [...(byLocation.get(key) ?? []), row]);
  }
  for (const [key, list] of byLocation) result.set(key, groupFindings(list));
  return result;
}

/** Open findings per severity within the same filters (the register's counts). */
export function countFindingsBySeverity(user: SessionUser, scope: Scope, query: Partial<FindingListQuery>): Record<Severity, number> {
  const counts = { critical: 0, high: 0, moderate: 0, low: 0 } as Record<Severity, number>;
  const rows = getDb()
    .select({ severity: findings.severity, n: count() })
    .from(findings)
    .where(findingFilters(user, scope, { ...query, severity: undefined }, countStatusMatch(scope, query)))
    .groupBy(findings.severity)
    .all();
  for (const row of rows) counts[row.severity] = row.n;
  return counts;
}

export function getFinding(user: SessionUser, scope: Scope, id: number) {
  const db = getDb();
  const row = db
    .select({ finding: findings, trace: findingTraces.trace, roomAssessedAt: rooms.assessedAt })
    .from(findings)
    .leftJoin(findingTraces, eq(findingTraces.findingId, findings.id))
    .leftJoin(rooms, eq(rooms.id, findings.roomId))
    .where(and(eq(findings.id, id), findingsVisibleTo(user, scope)))
    .get();
  if (!row) return null;
  const f = row.finding;
  const timeToDanger = f.timeToDangerMin == null ? null : { minutes: f.timeToDangerMin, threshold: f.timeToDangerThreshold ?? "", tempC: f.timeToDangerTempC ?? 0 };
  const finding = { ...f, timeToDanger, lastEvaluatedAt: lastAssessedAt(f, row.roomAssessedAt), trace: row.trace ?? null };
  const actor = alias(users, "actor");
  const events = db
    .select({ id: findingEvents.id, kind: findingEvents.kind, fromStatus: findingEvents.fromStatus, toStatus: findingEvents.toStatus, note: findingEvents.note, data: findingEvents.data, at: findingEvents.at, actorId: findingEvents.actorId, actorName: actor.name })
    .from(findingEvents)
    .leftJoin(actor, eq(actor.id, findingEvents.actorId))
    .where(eq(findingEvents.findingId, id))
    .orderBy(asc(findingEvents.at), asc(findingEvents.id))
    .all();
  return { finding, events };
}
