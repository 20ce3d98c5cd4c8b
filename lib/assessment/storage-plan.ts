import "server-only";
import { and, asc, eq, isNull } from "drizzle-orm";
import { z } from "zod";
import { getDb, preparedOn, type DbOrTx } from "@/db/client";
import { AMOUNT_UNITS, type AmountUnit, type ContainerState, type Severity, type StorageUnitKind } from "@/db/enums";
import { containers, mixtures, rooms, sites, storageUnits, substances } from "@/db/schema";
import { scopeFor } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session";
import { ConflictError, ForbiddenError, NotFoundError } from "@/lib/errors";
import { formatNumber } from "@/lib/format/numbers";
import type { TimeToDanger } from "@/lib/register/store";
import { optionalId, optionalNumber, requiredNumber } from "@/lib/validation/fields";
import { componentsOfMixtures, STANDING_STATUSES } from "./preview-current";
import { relatedTo, subjectOf, worse } from "./preview-related";
import { titleInSentence, type PreviewVerdict } from "./preview-verdict";
import { assessLocation, createAssessmentCache, severityRank, type AssessmentSettings, type CandidateFinding, type LocationSnapshot, type StoredContent, type StoredLiquid } from "./rules";
import { buildSnapshots, loadAssessmentSettings, SnapshotLibrary } from "./service";

const AMOUNT_UNIT_MESSAGE = `amountUnit must be one of: ${AMOUNT_UNITS.join(", ")}.`;

/** At most this many places are answered unless `limit` asks for fewer or more (1–50). */
export const STORAGE_PLAN_DEFAULT_LIMIT = 20;

export const storagePlanSchema = z
  .object({
    substanceId: optionalId("substance"),
    mixtureId: optionalId("mixture"),
    amount: requiredNumber({ label: "Amount", exclusiveMin: 0, max: 1e6 }),
    amountUnit: z.enum(AMOUNT_UNITS, { error: AMOUNT_UNIT_MESSAGE }),
    /** Only units at this site. */
    siteId: optionalId("site"),
    /** The room to be near (else the container's own room). */
    roomId: optionalId("room"),
    /** A stored container: plans moving it (its own unit is left out). */
    containerId: optionalId("container"),
    limit: optionalNumber({ label: "limit", min: 1, max: 50, integer: true }),
  })
  .superRefine((value, ctx) => {
    if ((value.substanceId == null) === (value.mixtureId == null)) ctx.addIssue({ code: "custom", path: ["substanceId"], message: "Give a substanceId or a mixtureId (one of them)." });
  });
export type StoragePlanInput = z.output<typeof storagePlanSchema>;

export type Nearness = "same_room" | "same_site" | "other_site";

/** One place the planner proposes, best first. */
export type StoragePlanItem = {
  storageUnitId: number;
  code: string;
  name: string;
  unitKind: StorageUnitKind;
  roomId: number;
  roomCode: string;
  roomName: string;
  siteId: number;
  siteName: string;
  /** From the point of view of this unit: nothing about it flagged, already flagged and kept so, or new or worse findings. */
  verdict: PreviewVerdict;
  /** The worst severity among the findings about it that storing it here would raise or keep; null when none. */
  worstSeverity: Severity | null;
  /** The highest ratio (value/limit) among them; null when none has a ratio. */
  maxRatio: number | null;
  /** The earliest time to danger among the control-lost findings it would raise or keep here; null when none. */
  timeToDanger: TimeToDanger | null;
  /** How many findings storing it here would raise or make worse. */
  raised: number;
  nearness: Nearness;
  /** One plain sentence: why this place ranks where it does. */
  reason: string;
};

export type StoragePlanResult = {
  items: StoragePlanItem[];
  /** Live units looked at (the container's own unit left out). */
  considered: number;
  /** Units left out because the new amount would not fit in their internal volume. */
  tooSmall: number;
  /** Only when no unit can hold the amount: says so. */
  message?: string;
};

/** What the planner places: new contents, or a stored container (`replacesContainerId`) as it would be. */
export type PlannedContent = {
  substanceId: number | null;
  mixtureId: number | null;
  amount: number;
  amountUnit: AmountUnit;
  state?: ContainerState;
  label: string;
  replacesContainerId?: number;
};

export type PlanOptions = {
  /** The room to be near: same room first, then the same site. */
  nearRoomId?: number | null;
  /** Only units at this site. */
  siteId?: number | null;
  /** Units left out (the container's own place, the unit the what-if already looks at). */
  excludeUnitIds?: readonly number[];
  limit?: number;
  nowMs?: number;
  /** Also answers the place of this unit (included in the ranking or not), to compare the others with it. */
  compareUnitId?: number;
};

type CandidateUnit = {
  id: number;
  code: string;
  name: string;
  kind: StorageUnitKind;
  internalVolumeL: number | null;
  roomId: number;
  roomCode: string;
  roomName: string;
  siteId: number;
  siteName: string;
};

const VERDICT_RANK: Record<PreviewVerdict, number> = { no_findings: 0, already_flagged: 1, raises: 2 };
const NEARNESS_RANK: Record<Nearness, number> = { same_room: 0, same_site: 1, other_site: 2 };

/** Litres of a stored liquid: volumes as given, masses through the liquid density (kg/m³ is g/L); null when the density is unknown. */
export function liquidVolumeL(liquid: Pick<StoredLiquid, "amount" | "amountUnit" | "content">): number | null {
  if (liquid.amountUnit === "mL") return liquid.amount / 1000;
  if (liquid.amountUnit === "L") return liquid.amount;
  const density = liquid.content.kind === "substance" ? liquid.content.substance.liquidDensityKgPerM3 : liquid.content.mixture.liquidDensityKgPerM3;
  if (density == null || !(density > 0)) return null;
  const grams = liquid.amountUnit === "g" ? liquid.amount : liquid.amount * 1000;
  return grams / density;
}

/** The live storage units people may choose for a container: the live units of live rooms at live sites (as the container form lists them). */
function liveUnits(db: DbOrTx, siteId: number | null | undefined): CandidateUnit[] {
  return db
    .select({
      id: storageUnits.id,
      code: storageUnits.code,
      name: storageUnits.name,
      kind: storageUnits.kind,
      internalVolumeL: storageUnits.internalVolumeL,
      roomId: rooms.id,
      roomCode: rooms.code,
      roomName: rooms.name,
      siteId: sites.id,
      siteName: sites.name,
    })
    .from(storageUnits)
    .innerJoin(rooms, eq(rooms.id, storageUnits.roomId))
    .innerJoin(sites, eq(sites.id, rooms.siteId))
    .where(and(isNull(storageUnits.retiredAt), isNull(rooms.retiredAt), isNull(sites.retiredAt), siteId != null ? eq(sites.id, siteId) : undefined))
    .orderBy(asc(sites.name), asc(rooms.code), asc(storageUnits.code))
    .all();
}

type StandingRow = { severity: Severity; ratio: number | null };

/** The register's standing findings (condition holding, not resolved) under these fingerprints, through its unique index. */
function standingByFingerprint(db: DbOrTx, fingerprints: string[]): Map<string, StandingRow> {
  if (fingerprints.length === 0) return new Map();
  const rows = preparedOn(
    db,
    `select fingerprint, severity, ratio from findings
      where fingerprint in (select value from json_each(?)) and status in (select value from json_each(?)) and condition_holds = 1`,
  ).all(JSON.stringify([...new Set(fingerprints)]), JSON.stringify(STANDING_STATUSES)) as (StandingRow & { fingerprint: string })[];
  return new Map(rows.map((row) => [row.fingerprint, row]));
}

/** A control-lost finding's time to danger, when the rules give one. */
function timeToDangerOf(c: CandidateFinding): TimeToDanger[] {
  const value = (c as { timeToDanger?: TimeToDanger | null }).timeToDanger;
  return value ? [value] : [];
}

const byWorst = <T extends { severity: Severity; ratio: number | null }>(a: T, b: T) => severityRank(b.severity) - severityRank(a.severity) || (b.ratio ?? -1) - (a.ratio ?? -1);

/** Orders two places: the verdict, the worst severity, the time to danger (longest first, none best), nearness, the highest ratio, then by code. */
export function comparePlaces(a: StoragePlanItem, b: StoragePlanItem): number {
  const danger = (item: StoragePlanItem) => item.timeToDanger?.minutes ?? Number.POSITIVE_INFINITY;
  const severity = (item: StoragePlanItem) => (item.worstSeverity ? severityRank(item.worstSeverity) : -1);
  return (
    VERDICT_RANK[a.verdict] - VERDICT_RANK[b.verdict] ||
    severity(a) - severity(b) ||
    (danger(a) === danger(b) ? 0 : danger(a) > danger(b) ? -1 : 1) ||
    NEARNESS_RANK[a.nearness] - NEARNESS_RANK[b.nearness] ||
    (a.maxRatio ?? -1) - (b.maxRatio ?? -1) ||
    a.siteName.localeCompare(b.siteName) ||
    a.roomCode.localeCompare(b.roomCode) ||
    a.code.localeCompare(b.code)
  );
}

/**
 * Whether a place is safer than another: a lower worst severity (nothing flagged about it counts
 * lowest), or the same with a longer time to danger. The verdict does not count here: where a
 * container stands, storing it there again raises nothing new by definition, so its own place
 * reads "already flagged" however bad it is; nor does nearness.
 */
export function saferThan(a: StoragePlanItem, b: StoragePlanItem): boolean {
  const danger = (item: StoragePlanItem) => item.timeToDanger?.minutes ?? Number.POSITIVE_INFINITY;
  const severity = (item: StoragePlanItem) => (item.worstSeverity ? severityRank(item.worstSeverity) : -1);
  if (severity(a) !== severity(b)) return severity(a) < severity(b);
  return danger(a) > danger(b);
}

/** A finding's title after a colon: the library's names lower-case as in the what-if's sentences, and "A 1 L spill…" as "a 1 L spill…". */
function inSentence(title: string, names: string[]): string {
  const text = titleInSentence(title, names);
  return text.startsWith("A ") ? `a${text.slice(1)}` : text;
}

function reasonFor(verdict: PreviewVerdict, names: string[], raised: readonly { title: string }[], kept: readonly { title: string }[]): string {
  if (verdict === "no_findings") return "Nothing would be raised here.";
  if (verdict === "already_flagged") return `Already flagged here: ${inSentence(kept[0].title, names)}; storing it keeps it so.`;
  const more = raised.length - 1;
  return `Would raise: ${inSentence(raised[0].title, names)}${more > 0 ? ` (and ${formatNumber(more)} more)` : ""}.`;
}

/**
 * The storage planner: every live unit where the content could go, assessed with it added (a
 * stored container taken out of its place), ranked best first. The rules run through the same
 * snapshots as the what-if, built once for every candidate room: each unit once with the content,
 * and each room's own rules once with it (which unit of the room holds it does not change the
 * room's contents). What they find about it is compared with the register's standing findings
 * under the same fingerprints — the places as they are now, which every change re-assesses — in
 * one query: a finding not standing, or worse than it stands, is raised; one standing and no worse
 * keeps the place flagged. Units whose internal volume cannot hold what is there plus the new
 * amount are left out before any rule runs.
 */
export function planPlaces(db: DbOrTx, content: PlannedContent, options: PlanOptions = {}): StoragePlanResult & { compared?: StoragePlanItem } {
  const nowMs = options.nowMs ?? Date.now();
  const limit = options.limit ?? STORAGE_PLAN_DEFAULT_LIMIT;
  const settings: AssessmentSettings = loadAssessmentSettings(db);
  const library = new SnapshotLibrary(db);
  library.load(content.substanceId != null ? [content.substanceId] : [], content.mixtureId != null ? [content.mixtureId] : []);
  const stored: StoredContent | null = library.content(content.substanceId, content.mixtureId);
  if (!stored) return { items: [], considered: 0, tooSmall: 0 };

  const excluded = new Set(options.excludeUnitIds ?? []);
  const units = liveUnits(db, options.siteId).filter((u) => !excluded.has(u.id) || u.id === options.compareUnitId);
  const nearRoom = options.nearRoomId != null ? db.select({ id: rooms.id, siteId: rooms.siteId }).from(rooms).where(eq(rooms.id, options.nearRoomId)).get() : undefined;

  const extra: StoredLiquid | null =
    content.state === "empty" || content.state === "disposed"
      ? null
      : { containerId: content.replacesContainerId ?? 0, label: content.label, content: stored, amount: content.amount, amountUnit: content.amountUnit, state: content.state ?? "sealed" };
  const newVolumeL = liquidVolumeL({ amount: content.amount, amountUnit: content.amountUnit, content: stored });
  const replaced = content.replacesContainerId;
  const withExtra = (contents: readonly StoredLiquid[]) => [...(replaced == null ? contents : contents.filter((c) => c.containerId !== replaced)), ...(extra ? [extra] : [])];

  const snapshots = buildSnapshots(db, [...new Set(units.map((u) => u.roomId))], nowMs, library);
  const unitSnapshots = new Map<number, Extract<LocationSnapshot, { kind: "unit" }>>();
  const roomSnapshots = new Map<number, Extract<LocationSnapshot, { kind: "room" }>>();
  for (const snapshot of snapshots) {
    if (snapshot.kind === "unit") unitSnapshots.set(snapshot.unit.id, snapshot);
    else roomSnapshots.set(snapshot.room.id, snapshot);
  }

  // Capacity: the liquid already in the unit plus the new amount must fit its internal volume.
  let tooSmall = 0;
  const fitting = units.filter((u) => {
    if (u.id === options.compareUnitId) return true;
    const snapshot = unitSnapshots.get(u.id);
    if (!snapshot) return false;
    if (u.internalVolumeL == null || newVolumeL == null) return true;
    const holdsL = snapshot.contents.reduce((sum, c) => (c.containerId === replaced ? sum : sum + (liquidVolumeL(c) ?? 0)), 0);
    if (holdsL + newVolumeL <= u.internalVolumeL * (1 + 1e-9)) return true;
    tooSmall += 1;
    return false;
  });
  const considered = units.filter((u) => u.id !== options.compareUnitId || !excluded.has(u.id)).length;

  const cache = createAssessmentCache();
  const names = [stored.kind === "substance" ? stored.substance.name : stored.mixture.name];
  const substanceIds = new Set(stored.kind === "substance" ? [stored.substance.id] : stored.mixture.components.map((c) => c.substance.id));
  const extraId = extra?.containerId ?? -1;
  /**
   * The findings that storing it can raise or change: those about it or a group it takes part in,
   * and those about the place itself (missing data of a unit that held no liquid before). A finding
   * about another substance, mixture or container stays as it is whatever is added beside it.
   */
  const mayConcern = (c: CandidateFinding) => {
    const subject = subjectOf(c.fingerprint).split("/")[0];
    if (subject.startsWith("substance:")) return substanceIds.has(Number(subject.slice("substance:".length)));
    if (subject.startsWith("mixture:")) return Number(subject.slice("mixture:".length)) === content.mixtureId;
    if (subject.startsWith("container:")) return Number(subject.slice("container:".length)) === extraId;
    return true;
  };
  const afterAt = (snapshot: LocationSnapshot): CandidateFinding[] => assessLocation({ ...snapshot, contents: withExtra(snapshot.contents) }, settings, { cache }).filter(mayConcern);
  const roomAfter = new Map<number, CandidateFinding[]>();
  const unitAfter = new Map<number, CandidateFinding[]>();
  for (const u of fitting) {
    unitAfter.set(u.id, afterAt(unitSnapshots.get(u.id)!));
    if (!roomAfter.has(u.roomId)) {
      const room = roomSnapshots.get(u.roomId);
      roomAfter.set(u.roomId, room ? afterAt(room) : []);
    }
  }

  // What stands in the register under the same fingerprints: the place as it is now, which every change re-assesses.
  const all = [...unitAfter.values(), ...roomAfter.values()].flat();
  const mixturesSeen = [...new Set(all.flatMap((c) => (c.mixtureId == null ? [] : [c.mixtureId])))];
  const aboutIt = relatedTo(stored, content.mixtureId, settings, componentsOfMixtures(db, mixturesSeen));
  const standing = standingByFingerprint(db, all.map((c) => c.fingerprint));

  const items: StoragePlanItem[] = [];
  let compared: StoragePlanItem | undefined;
  for (const u of fitting) {
    const raised: CandidateFinding[] = [];
    const kept: CandidateFinding[] = [];
    for (const c of [...unitAfter.get(u.id)!, ...roomAfter.get(u.roomId)!]) {
      const now = standing.get(c.fingerprint);
      if (!now || worse(c, now)) raised.push(c);
      else if (aboutIt(c)) kept.push(c);
    }
    raised.sort(byWorst);
    kept.sort(byWorst);
    const concerned = [...raised, ...kept];
    const verdict: PreviewVerdict = raised.length > 0 ? "raises" : kept.length > 0 ? "already_flagged" : "no_findings";
    const ratios = concerned.flatMap((c) => (c.ratio == null || !Number.isFinite(c.ratio) ? [] : [c.ratio]));
    const dangers = concerned.flatMap((c) => (c.scenario === "control_lost" ? timeToDangerOf(c) : []));
    const nearness: Nearness = nearRoom && u.roomId === nearRoom.id ? "same_room" : nearRoom && u.siteId === nearRoom.siteId ? "same_site" : "other_site";
    const item: StoragePlanItem = {
      storageUnitId: u.id,
      code: u.code,
      name: u.name,
      unitKind: u.kind,
      roomId: u.roomId,
      roomCode: u.roomCode,
      roomName: u.roomName,
      siteId: u.siteId,
      siteName: u.siteName,
      verdict,
      worstSeverity: [...concerned].sort(byWorst)[0]?.severity ?? null,
      maxRatio: ratios.length ? Math.max(...ratios) : null,
      timeToDanger: dangers.length ? dangers.reduce((a, b) => (b.minutes < a.minutes ? b : a)) : null,
      raised: raised.length,
      nearness,
      reason: reasonFor(verdict, names, raised, kept),
    };
    if (u.id === options.compareUnitId) compared = item;
    if (!excluded.has(u.id)) items.push(item);
  }
  items.sort(comparePlaces);
  const result: StoragePlanResult & { compared?: StoragePlanItem } = { items: items.slice(0, limit), considered, tooSmall, ...(compared ? { compared } : {}) };
  if (items.length === 0 && considered > 0 && tooSmall === considered) {
    result.message = `No storage unit has room for ${formatNumber(content.amount)} ${content.amountUnit} more: every live unit's internal volume is already too full for it.`;
  }
  return result;
}

/**
 * The places safer than the unit something is (or would be) in, best first: first among the units
 * of the site of `nearRoomId` — nearby, and a few hundred units at most however large the
 * organisation — and only when none there is safer, among all. For the what-if's alternatives and
 * the finding page's moves.
 */
export function saferPlacesThan(
  db: DbOrTx,
  content: PlannedContent,
  options: { unitId: number; nearRoomId: number | null; excludeUnitIds: readonly number[]; limit: number; nowMs?: number },
): StoragePlanItem[] {
  const site = options.nearRoomId != null ? db.select({ siteId: rooms.siteId }).from(rooms).where(eq(rooms.id, options.nearRoomId)).get() : undefined;
  const search = (siteId: number | null) => {
    const plan = planPlaces(db, content, { nearRoomId: options.nearRoomId, siteId, excludeUnitIds: options.excludeUnitIds, compareUnitId: options.unitId, limit: 50, nowMs: options.nowMs });
    const here = plan.compared;
    return plan.items.filter((item) => !here || saferThan(item, here));
  };
  const nearby = site ? search(site.siteId) : [];
  return (nearby.length > 0 ? nearby : search(null)).slice(0, options.limit);
}

/**
 * GET /api/v1/storage-plan: where this could go instead, best first. A stored container
 * (`containerId`) is planned as a move of that container — only by someone who may change it
 * (researchers: their own); its own unit is left out.
 */
export function planStorage(input: StoragePlanInput, user: SessionUser, nowMs = Date.now()): StoragePlanResult {
  const db = getDb();
  if (input.substanceId != null && !db.select({ id: substances.id }).from(substances).where(eq(substances.id, input.substanceId)).get()) {
    throw new NotFoundError(`No substance with id ${input.substanceId}.`);
  }
  if (input.mixtureId != null && !db.select({ id: mixtures.id }).from(mixtures).where(eq(mixtures.id, input.mixtureId)).get()) {
    throw new NotFoundError(`No mixture with id ${input.mixtureId}.`);
  }
  if (input.siteId != null && !db.select({ id: sites.id }).from(sites).where(eq(sites.id, input.siteId)).get()) throw new NotFoundError(`No site with id ${input.siteId}.`);
  if (input.roomId != null && !db.select({ id: rooms.id }).from(rooms).where(eq(rooms.id, input.roomId)).get()) throw new NotFoundError(`No room with id ${input.roomId}.`);
  const container =
    input.containerId != null
      ? db
          .select({ id: containers.id, label: containers.label, ownerId: containers.ownerId, state: containers.state, storageUnitId: containers.storageUnitId, roomId: storageUnits.roomId })
          .from(containers)
          .innerJoin(storageUnits, eq(storageUnits.id, containers.storageUnitId))
          .where(eq(containers.id, input.containerId))
          .get()
      : undefined;
  if (input.containerId != null) {
    if (!container) throw new NotFoundError(`No container with id ${input.containerId}.`);
    // The same rule as moving it: the role must change containers, "own" only one's own.
    if (scopeFor(user.role, "containers.write") === "own" && container.ownerId !== user.id) throw new ForbiddenError("You can plan moves of your own containers only.");
    if (container.state === "disposed") throw new ConflictError("This container was disposed of; its record is kept and cannot be moved.");
  }
  return planPlaces(
    db,
    {
      substanceId: input.substanceId ?? null,
      mixtureId: input.mixtureId ?? null,
      amount: input.amount,
      amountUnit: input.amountUnit,
      state: container?.state,
      label: container?.label ?? "(new container)",
      replacesContainerId: container?.id,
    },
    { nearRoomId: input.roomId ?? container?.roomId ?? null, siteId: input.siteId, excludeUnitIds: container ? [container.storageUnitId] : [], limit: input.limit ?? STORAGE_PLAN_DEFAULT_LIMIT, nowMs },
  );
}
