import "server-only";
import { getDb, preparedOn } from "@/db/client";
import type { Severity } from "@/db/enums";
import type { Scope } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session";
import { splitByScope, worstSeverity, type OpenFindingRow, type OpenFindingsHere } from "@/lib/register/open-findings";

/**
 * Open findings (every status but resolved) where people work: a room with its units, a storage
 * unit, a container. Prepared statements on the one connection; each starts from an index of
 * `findings` (room and unit, unit, container) and reads only that place's rows.
 *
 * Which findings a reader may open follows the register's scopes (db/queries/findings.ts
 * `findingsVisibleTo`): "all" sees every finding; with "own", a researcher sees the findings their
 * containers contribute to and those of the units they own, facilities staff those of the rooms
 * they are the contact for and of the units they own. The rest are counted, never described, so that a panel
 * never reads as "nothing here" when there is something the reader's role does not list.
 */

/** The reader's scope as statement parameters. */
function scopeParams(user: Pick<SessionUser, "id" | "role">, scope: Scope) {
  return { mode: scope === "all" ? "all" : user.role === "researcher" ? "researcher" : "contact", userId: user.id };
}

// The findings the reader's own live containers contribute to: the same rule as contributedBy in
// db/queries/findings.ts, on the alias f. Three lookups, each from the finding's own container,
// unit or room to the containers there ("+" keeps SQLite from starting at the reader's
// containers instead: for a person with thousands of them, every finding would read them all).
const CONTRIBUTION = `(
        c.substance_id = f.substance_id
        or c.mixture_id = f.mixture_id
        or (f.rule = 'enclosure-lfl' and f.substance_id is null and f.mixture_id is null and c.state in ('opened', 'in_use'))
        or f.rule = 'quantity-limit'
        or (f.rule in ('oxygen-depletion', 'co2-exposure') and cs.physical_state in ('cryogen', 'solid'))
      )`;
const CONTRIBUTED_BY_OWN = `(
    exists (select 1 from containers c
      where c.id = f.container_id and c.owner_id = @userId and c.state not in ('empty', 'disposed'))
    or exists (select 1 from containers c left join substances cs on cs.id = c.substance_id
      where c.storage_unit_id = f.storage_unit_id and +c.owner_id = @userId and c.state not in ('empty', 'disposed') and ${CONTRIBUTION})
    or exists (select 1 from storage_units cu join containers c on c.storage_unit_id = cu.id left join substances cs on cs.id = c.substance_id
      where f.storage_unit_id is null and cu.room_id = f.room_id and +c.owner_id = @userId and c.state not in ('empty', 'disposed') and ${CONTRIBUTION})
  )`;

// The same rule as findingsVisibleTo, as a column: 1 when the reader may open the finding.
const VISIBLE = `case @mode
    when 'all' then 1
    when 'researcher' then (f.container_id in (select id from containers where owner_id = @userId)
                            or f.storage_unit_id in (select id from storage_units where owner_id = @userId)
                            or ${CONTRIBUTED_BY_OWN})
    else (f.room_id in (select id from rooms where facilities_contact_id = @userId)
          or f.storage_unit_id in (select id from storage_units where owner_id = @userId))
  end`;

const COLUMNS = `f.id, f.severity, f.status, f.title, f.scenario, f.value, f.limit_value as "limit", f.ratio, f.unit,
  f.room_id as roomId, f.storage_unit_id as storageUnitId, u.code as unitCode, ${VISIBLE} as visible`;

const SEVERITY_ORDER = `case f.severity when 'critical' then 4 when 'high' then 3 when 'moderate' then 2 else 1 end desc, f.ratio desc nulls last, f.id`;

/** A room's findings: its own (unit null) and its units', by the (room_id, storage_unit_id) index. */
export const ROOM_FINDINGS_SQL = `select ${COLUMNS}
  from findings f left join storage_units u on u.id = f.storage_unit_id
  where f.room_id = @roomId and f.status <> 'resolved'
  order by ${SEVERITY_ORDER}`;

/** A storage unit's findings, by the storage_unit_id index. */
export const UNIT_FINDINGS_SQL = `select ${COLUMNS}
  from findings f left join storage_units u on u.id = f.storage_unit_id
  where f.storage_unit_id = @storageUnitId and f.status <> 'resolved'
  order by ${SEVERITY_ORDER}`;

/**
 * The findings a container contributes to. A finding records one container (the largest of its
 * substance or mixture there), not every container it concerns; the others contribute through
 * their location and contents: a unit's findings of the same substance or mixture, and the
 * room's own findings (unit null) of it, which count every container in the room's units. A
 * container that is empty or disposed of is left out of assessments, so only the finding that
 * still records it matches. Location-wide findings with no substance or mixture (quantity limits,
 * oxygen, carbon dioxide) match only the container they record.
 * Three index lookups joined by UNION: container_id, storage_unit_id, (room_id, storage_unit_id).
 */
export const CONTAINER_FINDINGS_SQL = `with here(id) as (
    select id from findings where container_id = @containerId
    union
    select id from findings where @live = 1 and storage_unit_id = @storageUnitId
      and (substance_id = @substanceId or mixture_id = @mixtureId)
    union
    select id from findings where @live = 1 and room_id = @roomId and storage_unit_id is null
      and (substance_id = @substanceId or mixture_id = @mixtureId)
  )
  select ${COLUMNS}
  from here cross join findings f on f.id = here.id left join storage_units u on u.id = f.storage_unit_id
  where f.status <> 'resolved'
  order by ${SEVERITY_ORDER}`;

/** The container facts the match needs: its location and contents, and whether assessments count it. */
export const CONTAINER_PLACE_SQL = `select c.id as containerId, c.storage_unit_id as storageUnitId, u.room_id as roomId,
    c.substance_id as substanceId, c.mixture_id as mixtureId, c.owner_id as ownerId,
    case when c.state in ('empty', 'disposed') then 0 else 1 end as live
  from containers c join storage_units u on u.id = c.storage_unit_id
  where c.id in (select value from json_each(@ids))`;

type RawRow = Omit<OpenFindingRow, "visible"> & { visible: number };
type ContainerPlace = { containerId: number; storageUnitId: number; roomId: number; substanceId: number | null; mixtureId: number | null; ownerId: number | null; live: number };

function rowsOf(raw: RawRow[]): OpenFindingRow[] {
  return raw.map((row) => ({ ...row, visible: row.visible === 1 }));
}

function containerRows(place: ContainerPlace, params: ReturnType<typeof scopeParams>): RawRow[] {
  return preparedOn(getDb(), CONTAINER_FINDINGS_SQL).all({
    ...params,
    containerId: place.containerId,
    storageUnitId: place.storageUnitId,
    roomId: place.roomId,
    substanceId: place.substanceId,
    mixtureId: place.mixtureId,
    live: place.live,
  }) as RawRow[];
}

/** A room's open findings, its units' included (each item carries its unit). */
export function openFindingsInRoom(user: SessionUser, scope: Scope, roomId: number): OpenFindingsHere {
  const raw = preparedOn(getDb(), ROOM_FINDINGS_SQL).all({ ...scopeParams(user, scope), roomId }) as RawRow[];
  return splitByScope(rowsOf(raw), scope);
}

/** A storage unit's open findings. */
export function openFindingsInUnit(user: SessionUser, scope: Scope, storageUnitId: number): OpenFindingsHere {
  const raw = preparedOn(getDb(), UNIT_FINDINGS_SQL).all({ ...scopeParams(user, scope), storageUnitId }) as RawRow[];
  return splitByScope(rowsOf(raw), scope);
}

/** The open findings a container contributes to; null when there is no such container. */
export function openFindingsOfContainer(user: SessionUser, scope: Scope, containerId: number): OpenFindingsHere | null {
  const place = preparedOn(getDb(), CONTAINER_PLACE_SQL).get({ ids: JSON.stringify([containerId]) }) as ContainerPlace | undefined;
  if (!place) return null;
  return splitByScope(rowsOf(containerRows(place, scopeParams(user, scope))), scope);
}

/**
 * The worst severity of the open findings each container contributes to, for the inventory list's
 * marker. Counted are the findings the reader may open and, for the reader's own containers, every
 * finding they contribute to (the container page then says how many lie outside the reader's view).
 * Containers with none are absent from the map. One small statement per container of the page.
 */
export function worstOpenSeverityByContainer(user: SessionUser, scope: Scope | null, containerIds: readonly number[]): Map<number, Severity> {
  const result = new Map<number, Severity>();
  if (!scope || containerIds.length === 0) return result;
  const params = scopeParams(user, scope);
  const places = preparedOn(getDb(), CONTAINER_PLACE_SQL).all({ ids: JSON.stringify(containerIds) }) as ContainerPlace[];
  for (const place of places) {
    const own = place.ownerId === user.id;
    const worst = worstSeverity(containerRows(place, params).flatMap((row) => (own || row.visible === 1 ? [row.severity] : [])));
    if (worst) result.set(place.containerId, worst);
  }
  return result;
}

/**
 * Open findings (open, acknowledged, mitigating) that a researcher's live containers contribute to
 * but that the researcher's own scope does not list (none while the scope follows contributedBy;
 * the Overview says so should the two ever part): the findings of the same contents in the same unit, and the room's own findings
 * of them. Counted per severity for the Overview, never described. CROSS JOIN keeps SQLite's
 * join order: the reader's few containers outside, each finding reached by its index (left to
 * choose, the planner may walk every open finding instead).
 */
export const CONTRIBUTED_ELSEWHERE_SQL = `with mine as (
    select c.storage_unit_id as unitId, u.room_id as roomId, c.substance_id as substanceId, c.mixture_id as mixtureId
      from containers c join storage_units u on u.id = c.storage_unit_id
      where c.owner_id = @userId and c.state not in ('empty', 'disposed')
      group by 1, 2, 3, 4
  ),
  here(id) as (
    select f.id from mine cross join findings f on f.storage_unit_id = mine.unitId
      and (f.substance_id = mine.substanceId or f.mixture_id = mine.mixtureId)
    union
    select f.id from mine cross join findings f on f.room_id = mine.roomId and f.storage_unit_id is null
      and (f.substance_id = mine.substanceId or f.mixture_id = mine.mixtureId)
  )
  select f.severity, count(*) as n
  from here cross join findings f on f.id = here.id
  where f.status in ('open', 'acknowledged', 'mitigating') and not (${VISIBLE})
  group by f.severity`;

export function openFindingsContributedElsewhere(user: SessionUser): { count: number; worst: Severity | null } {
  const rows = preparedOn(getDb(), CONTRIBUTED_ELSEWHERE_SQL).all({ ...scopeParams(user, "own"), userId: user.id }) as { severity: Severity; n: number }[];
  return { count: rows.reduce((sum, row) => sum + row.n, 0), worst: worstSeverity(rows.map((row) => row.severity)) };
}
