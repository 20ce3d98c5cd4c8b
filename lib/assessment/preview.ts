import "server-only";
import { eq } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { AMOUNT_UNITS, CONTAINER_STATES } from "@/db/enums";
import { containers, mixtures, storageUnits, substances } from "@/db/schema";
import { NotFoundError, ValidationError } from "@/lib/errors";
import { containerAmountSchema } from "@/lib/inventory/schemas";
import { optionalId, requiredId } from "@/lib/validation/fields";
import { assessLocation, createAssessmentCache, severityRank } from "./rules";
import { buildSnapshots, loadAssessmentSettings, SnapshotLibrary, toStoredCandidate } from "./service";

export const assessmentPreviewSchema = z
  .object({
    storageUnitId: requiredId("storage unit"),
    substanceId: optionalId("substance"),
    mixtureId: optionalId("mixture"),
    amount: containerAmountSchema,
    amountUnit: z.enum(AMOUNT_UNITS, { error: `amountUnit must be one of: ${AMOUNT_UNITS.join(", ")}.` }),
    /** Optional: the stored container being edited, which the preview replaces by this one. */
    containerId: optionalId("container"),
    /** Optional: the container's state (sealed when not given; empty or disposed stores nothing). */
    state: z.enum(CONTAINER_STATES, { error: `state must be one of: ${CONTAINER_STATES.join(", ")}.` }).optional(),
  })
  .superRefine((value, ctx) => {
    if ((value.substanceId == null) === (value.mixtureId == null)) ctx.addIssue({ code: "custom", path: ["substanceId"], message: "Give a substanceId or a mixtureId (one of them)." });
  });
export type AssessmentPreviewInput = z.output<typeof assessmentPreviewSchema>;

/**
 * What-if: the findings that storing this amount in this unit would raise or make worse, computed
 * on the current state plus the new container (or with an edited container as it would be), without
 * writing anything.
 */
export function previewStoring(input: AssessmentPreviewInput, nowMs = Date.now()) {
  const db = getDb();
  const unit = db.select({ id: storageUnits.id, roomId: storageUnits.roomId, code: storageUnits.code, retiredAt: storageUnits.retiredAt }).from(storageUnits).where(eq(storageUnits.id, input.storageUnitId)).get();
  if (!unit || unit.retiredAt) throw new NotFoundError("No such storage unit.");
  if (input.substanceId != null && !db.select({ id: substances.id }).from(substances).where(eq(substances.id, input.substanceId)).get()) {
    throw new ValidationError("Choose an existing substance.", { substanceId: ["Choose an existing substance."] });
  }
  if (input.mixtureId != null && !db.select({ id: mixtures.id }).from(mixtures).where(eq(mixtures.id, input.mixtureId)).get()) {
    throw new ValidationError("Choose an existing mixture.", { mixtureId: ["Choose an existing mixture."] });
  }
  let label = "(new container)";
  if (input.containerId != null) {
    const stored = db.select({ id: containers.id, label: containers.label }).from(containers).where(eq(containers.id, input.containerId)).get();
    if (!stored) throw new ValidationError("Choose an existing container.", { containerId: ["No such container."] });
    label = stored.label;
  }
  const settings = loadAssessmentSettings(db);
  const library = new SnapshotLibrary(db);
  const cache = createAssessmentCache();
  const run = (withNew: boolean) =>
    buildSnapshots(db, [unit.roomId], nowMs, library, withNew ? [{ storageUnitId: unit.id, substanceId: input.substanceId ?? null, mixtureId: input.mixtureId ?? null, amount: input.amount, amountUnit: input.amountUnit, label, state: input.state, replacesContainerId: input.containerId ?? undefined }] : [])
      .flatMap((snapshot) => assessLocation(snapshot, settings, { cache }))
      .map(toStoredCandidate);
  const before = new Map(run(false).map((c) => [c.fingerprint, c]));
  const after = run(true);
  const raised = after.filter((c) => {
    const old = before.get(c.fingerprint);
    if (!old) return true;
    return severityRank(c.severity) > severityRank(old.severity) || (c.ratio ?? 0) > (old.ratio ?? 0) * 1.01;
  });
  raised.sort((a, b) => severityRank(b.severity) - severityRank(a.severity) || (b.ratio ?? 0) - (a.ratio ?? 0));
  return {
    storageUnitId: unit.id,
    findings: raised.map((c) => ({
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
      isNew: !before.has(c.fingerprint),
      previous: before.has(c.fingerprint) ? { severity: before.get(c.fingerprint)!.severity, ratio: before.get(c.fingerprint)!.ratio } : null,
      trace: c.trace,
    })),
  };
}
