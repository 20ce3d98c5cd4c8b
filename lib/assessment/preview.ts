import "server-only";
import { and, eq, inArray } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { AMOUNT_UNITS, CONTAINER_STATES, type FindingStatus, type Scenario, type Severity } from "@/db/enums";
import { containers, findings, mixtures, storageUnits, substances } from "@/db/schema";
import { scopeFor } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session";
import { ConflictError, ForbiddenError, NotFoundError, ValidationError } from "@/lib/errors";
import { containerAmountSchema } from "@/lib/inventory/schemas";
import type { FindingCandidate } from "@/lib/register/store";
import { optionalId, requiredId } from "@/lib/validation/fields";
import { componentsOfMixtures, findingIdsVisibleTo, STANDING_STATUSES, standingFindingsAt } from "./preview-current";
import { better, relatedTo, worse } from "./preview-related";
import { previewVerdict, verdictSentence, type CurrentOutcome, type PreviewMode, type PreviewVerdict } from "./preview-verdict";
import { assessLocation, createAssessmentCache, severityRank } from "./rules";
import { buildSnapshots, loadAssessmentSettings, SnapshotLibrary, toStoredCandidate } from "./service";
import { saferPlacesThan, type PlannedContent, type StoragePlanItem } from "./storage-plan";

const AMOUNT_UNIT_MESSAGE = `amountUnit must be one of: ${AMOUNT_UNITS.join(", ")}.`;

export const assessmentPreviewSchema = z
  .object({
    storageUnitId: requiredId("storage unit"),
    substanceId: optionalId("substance"),
    mixtureId: optionalId("mixture"),
    amount: containerAmountSchema.optional(),
    amountUnit: z.enum(AMOUNT_UNITS, { error: AMOUNT_UNIT_MESSAGE }).optional(),
    /**
     * Optional: a stored container. With the contents (substanceId or mixtureId, amount, amountUnit)
     * it is an edit of that container, which the preview replaces by this one; with none of them it
     * is a move: its stored contents are taken out of its place and assessed at storageUnitId.
     */
    containerId: optionalId("container"),
    /** Optional: the container's state (a new container's is sealed when not given; empty or disposed stores nothing). */
    state: z.enum(CONTAINER_STATES, { error: `state must be one of: ${CONTAINER_STATES.join(", ")}.` }).optional(),
  })
  .superRefine((value, ctx) => {
    const moving = value.containerId != null && value.substanceId == null && value.mixtureId == null && value.amount === undefined && value.amountUnit === undefined;
    if (moving) return;
    if ((value.substanceId == null) === (value.mixtureId == null)) ctx.addIssue({ code: "custom", path: ["substanceId"], message: "Give a substanceId or a mixtureId (one of them)." });
    if (value.amount === undefined) ctx.addIssue({ code: "custom", path: ["amount"], message: "Amount is required." });
    if (value.amountUnit === undefined) ctx.addIssue({ code: "custom", path: ["amountUnit"], message: AMOUNT_UNIT_MESSAGE });
  });
export type AssessmentPreviewInput = z.output<typeof assessmentPreviewSchema>;

export type PreviewFinding = {
  rule: string;
  severity: Severity;
  scenario: Scenario;
  title: string;
  value: number | null;
  limit: number | null;
  ratio: number | null;
  unit: string | null;
  worstCaseTempC: number | null;
  worstCaseSource: string | null;
  storageUnitId: number | null;
  roomId: number | null;
  isNew: boolean;
  previous: { severity: Severity; ratio: number | null } | null;
  trace: unknown;
};

/** A finding standing in the register where the container would go, about the same substance or its group. */
export type PreviewCurrentFinding = {
  id: number;
  rule: string;
  severity: Severity;
  status: FindingStatus;
  scenario: Scenario;
  title: string;
  value: number | null;
  limit: number | null;
  ratio: number | null;
  unit: string | null;
  storageUnitId: number | null;
  roomId: number | null;
  substanceId: number | null;
  mixtureId: number | null;
  /** "substance": about the stored substance or mixture itself; "group": a finding it takes part in (a mixture holding it, open containers together, a quantity limit). */
  about: "substance" | "group";
  /** What the change would do to it; "worse" ones are among `findings` too. */
  outcome: CurrentOutcome;
  /** The finding as it would be after the change (null when the change clears it). */
  after: { severity: Severity; ratio: number | null; value: number | null } | null;
  /** Whether this person may open it in the register (/register/{id}). */
  canOpen: boolean;
};

export type PreviewResult = {
  storageUnitId: number;
  findings: PreviewFinding[];
  current: PreviewCurrentFinding[];
  verdict: PreviewVerdict;
  verdictSentence: string;
  /** A move's bonus: findings standing at the container's old place that the move would clear, worst first. */
  cleared: { id: number; severity: Severity; title: string; canOpen: boolean }[];
  /** Safer places for it, best first (at most five; the storage planner's items): only when the verdict is not "no_findings", else empty. */
  alternatives: StoragePlanItem[];
};

const byWorst = <T extends { severity: Severity; ratio: number | null }>(a: T, b: T) => severityRank(b.severity) - severityRank(a.severity) || (b.ratio ?? -1) - (a.ratio ?? -1);

/**
 * What-if: the findings that storing this amount in this unit would raise or make worse, computed
 * on the current state plus the new container (an edited container as it would be, a moved one at
 * its new place and gone from its old), without writing anything; the findings already standing
 * there about the same substance or its group; and a verdict with its sentence. A stored container
 * is previewed only by someone who may change it (researchers: their own).
 */
export function previewStoring(input: AssessmentPreviewInput, user: SessionUser, nowMs = Date.now()): PreviewResult {
  const db = getDb();
  const unit = db.select({ id: storageUnits.id, roomId: storageUnits.roomId, code: storageUnits.code, retiredAt: storageUnits.retiredAt }).from(storageUnits).where(eq(storageUnits.id, input.storageUnitId)).get();
  if (!unit || unit.retiredAt) throw new NotFoundError("No such storage unit.");
  if (input.substanceId != null && !db.select({ id: substances.id }).from(substances).where(eq(substances.id, input.substanceId)).get()) {
    throw new ValidationError("Choose an existing substance.", { substanceId: ["Choose an existing substance."] });
  }
  if (input.mixtureId != null && !db.select({ id: mixtures.id }).from(mixtures).where(eq(mixtures.id, input.mixtureId)).get()) {
    throw new ValidationError("Choose an existing mixture.", { mixtureId: ["Choose an existing mixture."] });
  }

  const stored = input.containerId != null ? db.select().from(containers).where(eq(containers.id, input.containerId)).get() : undefined;
  if (input.containerId != null) {
    if (!stored) throw new ValidationError("Choose an existing container.", { containerId: ["No such container."] });
    // The same rule as the container routes: the role must change containers, "own" only one's own.
    const scope = scopeFor(user.role, "containers.write");
    if (scope === null) throw new ForbiddenError("Your role cannot change containers, so it cannot preview changing one.");
    if (scope === "own" && stored.ownerId !== user.id) throw new ForbiddenError("You can change only your own containers.");
    if (stored.state === "disposed") throw new ConflictError("This container was disposed of; its record is kept and cannot be changed.");
  }
  const mode: PreviewMode = !stored ? "store" : input.substanceId == null && input.mixtureId == null && input.amount === undefined ? "move" : "edit";
  if (mode === "move" && stored!.storageUnitId === unit.id) {
    throw new ValidationError("The container is already in that storage unit.", { storageUnitId: ["The container is already in that storage unit."] });
  }
  const content =
    mode === "move"
      ? { substanceId: stored!.substanceId, mixtureId: stored!.mixtureId, amount: stored!.amount, amountUnit: stored!.amountUnit, state: input.state ?? stored!.state }
      : { substanceId: input.substanceId ?? null, mixtureId: input.mixtureId ?? null, amount: input.amount!, amountUnit: input.amountUnit!, state: input.state ?? stored?.state };

  // Where the container stands now, when it leaves that place.
  const source =
    stored && stored.storageUnitId !== unit.id ? db.select({ id: storageUnits.id, roomId: storageUnits.roomId, code: storageUnits.code }).from(storageUnits).where(eq(storageUnits.id, stored.storageUnitId)).get() : undefined;
  const atSource = (c: { storageUnitId: number | null; roomId: number | null }) =>
    source !== undefined && (c.storageUnitId === source.id || (c.storageUnitId === null && source.roomId !== unit.roomId && c.roomId === source.roomId));

  const settings = loadAssessmentSettings(db);
  const library = new SnapshotLibrary(db);
  library.load(content.substanceId != null ? [content.substanceId] : [], content.mixtureId != null ? [content.mixtureId] : []);
  const cache = createAssessmentCache();
  const roomIds = [...new Set([unit.roomId, ...(source ? [source.roomId] : [])])];
  const extra = { storageUnitId: unit.id, ...content, label: stored?.label ?? "(new container)", replacesContainerId: stored?.id };
  const run = (withChange: boolean): FindingCandidate[] =>
    buildSnapshots(db, roomIds, nowMs, library, withChange ? [extra] : [])
      .flatMap((snapshot) => assessLocation(snapshot, settings, { cache }))
      .map(toStoredCandidate);
  const before = new Map(run(false).map((c) => [c.fingerprint, c]));
  const afterList = run(true);
  const after = new Map(afterList.map((c) => [c.fingerprint, c]));

  const raised = afterList.filter((c) => {
    if (atSource(c)) return false;
    const old = before.get(c.fingerprint);
    return !old || worse(c, old);
  });
  raised.sort(byWorst);

  // The findings standing where it would go, about the same substance or its group.
  const storedContent = library.content(content.substanceId, content.mixtureId);
  const standing = standingFindingsAt(db, unit);
  const components = componentsOfMixtures(db, [...new Set(standing.flatMap((f) => (f.mixtureId == null ? [] : [f.mixtureId])))]);
  const aboutIt = relatedTo(storedContent, content.mixtureId, settings, components);
  const related = standing.flatMap((f) => {
    const about = aboutIt(f);
    return about ? [{ f, about }] : [];
  });
  const otherStandingCount = standing.length - related.length;

  // For a move: what leaves the old place with it.
  const clearedFingerprints = source ? [...before.values()].filter((c) => atSource(c) && !after.has(c.fingerprint)).map((c) => c.fingerprint) : [];
  const clearedRows = clearedFingerprints.length
    ? db
        .select({ id: findings.id, severity: findings.severity, title: findings.title, ratio: findings.ratio })
        .from(findings)
        .where(and(inArray(findings.fingerprint, clearedFingerprints), inArray(findings.status, [...STANDING_STATUSES])))
        .all()
        .sort(byWorst)
    : [];

  const visible = findingIdsVisibleTo(db, user, [...related.map((r) => r.f.id), ...clearedRows.map((r) => r.id)]);
  const current: PreviewCurrentFinding[] = related.map(({ f, about }) => {
    const now = after.get(f.fingerprint);
    const was = before.get(f.fingerprint) ?? f;
    const outcome: CurrentOutcome = !now ? (before.has(f.fingerprint) ? "cleared" : "unchanged") : worse(now, was) ? "worse" : better(now, was) ? "better" : "unchanged";
    return {
      id: f.id,
      rule: f.rule,
      severity: f.severity,
      status: f.status,
      scenario: f.scenario,
      title: f.title,
      value: f.value,
      limit: f.limitValue,
      ratio: f.ratio,
      unit: f.unit,
      storageUnitId: f.storageUnitId,
      roomId: f.roomId,
      substanceId: f.substanceId,
      mixtureId: f.mixtureId,
      about,
      outcome,
      after: now ? { severity: now.severity, ratio: now.ratio, value: now.value } : outcome === "cleared" ? null : { severity: f.severity, ratio: f.ratio, value: f.value },
      canOpen: visible.has(f.id),
    };
  });
  // Worst first; of equal severity, findings about the substance itself before those it takes part in.
  current.sort((a, b) => severityRank(b.severity) - severityRank(a.severity) || (a.about === b.about ? 0 : a.about === "substance" ? -1 : 1) || (b.ratio ?? -1) - (a.ratio ?? -1));

  const contentName = storedContent?.kind === "substance" ? storedContent.substance.name : storedContent?.kind === "mixture" ? storedContent.mixture.name : "it";
  const withPrevious = raised.map((c) => {
    const old = before.get(c.fingerprint);
    return { c, previous: old ? { severity: old.severity, ratio: old.ratio } : null };
  });
  const facts = {
    mode,
    unitCode: unit.code,
    contentName,
    raised: withPrevious.map(({ c, previous }) => ({ severity: c.severity, title: c.title, isNew: previous === null, previous })),
    current,
    otherStandingCount,
    cleared: clearedRows,
    sourceUnitCode: source?.code ?? null,
  };
  const verdict = previewVerdict(facts);
  return {
    storageUnitId: unit.id,
    findings: withPrevious.map(({ c, previous }) => ({
      rule: c.rule,
      severity: c.severity,
      scenario: c.scenario,
      title: c.title,
      value: c.value,
      limit: c.limitValue,
      ratio: c.ratio,
      unit: c.unit,
      worstCaseTempC: c.worstCaseTempC,
      worstCaseSource: c.worstCaseSource,
      storageUnitId: c.storageUnitId,
      roomId: c.roomId,
      isNew: previous === null,
      previous,
      trace: c.trace,
    })),
    current,
    verdict,
    verdictSentence: verdictSentence(facts),
    cleared: clearedRows.map((r) => ({ id: r.id, severity: r.severity, title: r.title, canOpen: visible.has(r.id) })),
    alternatives: verdict === "no_findings" ? [] : saferPlaces(db, { ...content, label: stored?.label ?? "(new container)", replacesContainerId: stored?.id }, unit, source, nowMs),
  };
}

/** How many safer places the what-if offers. */
const ALTERNATIVES = 5;

/**
 * The storage planner's best places for what the what-if looks at, safer than the unit it looks at,
 * other than that unit and the container's own place: near the container's place (a new
 * container: the unit's room), at that site first.
 */
function saferPlaces(
  db: ReturnType<typeof getDb>,
  content: PlannedContent,
  unit: { id: number; roomId: number },
  source: { id: number; roomId: number } | undefined,
  nowMs: number,
): StoragePlanItem[] {
  return saferPlacesThan(db, content, { unitId: unit.id, nearRoomId: source?.roomId ?? unit.roomId, excludeUnitIds: [unit.id, ...(source ? [source.id] : [])], limit: ALTERNATIVES, nowMs });
}
