import "server-only";
import { kickReassessments, queueReassessment, roomsHoldingSubstance } from "@/lib/assessment/jobs";
import { asc, eq } from "drizzle-orm";
import { getDb, type DbOrTx } from "@/db/client";
import { exposureLimits, substances, type Substance } from "@/db/schema";
import { auditSnapshot, changedFields } from "@/lib/audit/diff";
import { recordAudit } from "@/lib/audit/record";
import type { SessionUser } from "@/lib/auth/session";
import { rethrowConstraint } from "@/lib/db-errors";
import { ConflictError, NotFoundError, ValidationError } from "@/lib/errors";
import { HazardInputError, validateVaporProperties } from "@/lib/hazard";
import type { SubstanceWriteInput } from "./schemas";
import { toVaporProperties } from "./vapor";

const CAS_UNIQUE = { "substances.cas": { field: "cas", message: "A substance with this CAS number is already in the library." } };

type Limits = NonNullable<SubstanceWriteInput["exposureLimits"]>;

/** The engine must accept the values (correlations with usable ranges, positive molar mass…). */
function checkWithEngine(row: Parameters<typeof toVaporProperties>[0]): void {
  try {
    validateVaporProperties(toVaporProperties(row));
  } catch (error) {
    if (error instanceof HazardInputError) {
      const field = error.field.startsWith("props.correlations") ? "correlations" : error.field.replace(/^props\./, "");
      throw new ValidationError(error.message, { [field]: [error.message] });
    }
    throw error;
  }
}

function columnsFrom(input: SubstanceWriteInput) {
  return {
    cas: input.cas ?? null,
    name: input.name,
    synonyms: input.synonyms ?? [],
    formula: input.formula ?? null,
    physicalState: input.physicalState ?? "liquid",
    molarMassGPerMol: input.molarMassGPerMol,
    normalBoilingPointC: input.normalBoilingPointC ?? null,
    meltingPointC: input.meltingPointC ?? null,
    enthalpyOfVaporizationKJPerMol: input.enthalpyOfVaporizationKJPerMol ?? null,
    enthalpyOfSublimationKJPerMol: input.enthalpyOfSublimationKJPerMol ?? null,
    liquidDensityKgPerM3: input.liquidDensityKgPerM3 ?? null,
    flashPointC: input.flashPointC ?? null,
    lflVolPercent: input.lflVolPercent ?? null,
    uflVolPercent: input.uflVolPercent ?? null,
    autoignitionTempC: input.autoignitionTempC ?? null,
    correlations: (input.correlations ?? []) as Substance["correlations"],
    sources: Object.fromEntries(Object.entries(input.sources ?? {}).filter(([, v]) => v.trim() !== "")),
    notes: input.notes ?? null,
  };
}

function limitsOf(tx: DbOrTx, substanceId: number) {
  return tx
    .select({ kind: exposureLimits.kind, value: exposureLimits.value, unit: exposureLimits.unit, body: exposureLimits.body, source: exposureLimits.source, note: exposureLimits.note })
    .from(exposureLimits)
    .where(eq(exposureLimits.substanceId, substanceId))
    .orderBy(asc(exposureLimits.id))
    .all();
}

function replaceLimits(tx: DbOrTx, substanceId: number, limits: Limits): void {
  tx.delete(exposureLimits).where(eq(exposureLimits.substanceId, substanceId)).run();
  if (limits.length) tx.insert(exposureLimits).values(limits.map((l) => ({ ...l, note: l.note ?? null, substanceId }))).run();
}

export function createSubstance(actor: SessionUser, input: SubstanceWriteInput): Substance {
  const values = columnsFrom(input);
  checkWithEngine(values);
  try {
    return getDb().transaction((tx) => {
      const row = tx.insert(substances).values({ ...values, updatedById: actor.id }).returning().get();
      replaceLimits(tx, row.id, input.exposureLimits ?? []);
      recordAudit(tx, actor, {
        action: "create",
        entityType: "substance",
        entityId: row.id,
        summary: `Added ${row.name}${row.cas ? ` (CAS ${row.cas})` : ""} to the substance library`,
        after: { ...auditSnapshot(row), exposureLimits: input.exposureLimits ?? [] },
      });
      return row;
    });
  } catch (error) {
    rethrowConstraint(error, CAS_UNIQUE);
  }
}

/**
 * Replaces a substance's values with the edited record. The audit event keeps every changed value
 * before and after, which is the substance's visible history.
 */
export function updateSubstance(actor: SessionUser, id: number, input: SubstanceWriteInput): Substance {
  const values = columnsFrom(input);
  checkWithEngine(values);
  try {
    const result = getDb().transaction((tx) => {
      const before = tx.select().from(substances).where(eq(substances.id, id)).get();
      if (!before) throw new NotFoundError("That substance");
      const limitsBefore = limitsOf(tx, id);
      const after = tx.update(substances).set({ ...values, updatedAt: new Date(), updatedById: actor.id }).where(eq(substances.id, id)).returning().get();
      if (input.exposureLimits !== undefined) replaceLimits(tx, id, input.exposureLimits);
      const limitsAfter = limitsOf(tx, id);
      const diff = changedFields(
        { ...auditSnapshot(before), exposureLimits: limitsBefore },
        { ...auditSnapshot(after), exposureLimits: limitsAfter },
        ["updatedAt", "createdAt", "updatedById"],
      );
      if (diff.keys.length) {
        recordAudit(tx, actor, {
          action: "update",
          entityType: "substance",
          entityId: id,
          summary: `Corrected ${after.name}: ${diff.keys.join(", ")}`,
          before: diff.before,
          after: diff.after,
        });
        queueReassessment(tx, { roomIds: roomsHoldingSubstance(tx, id), reason: `${after.name} corrected (${diff.keys.join(", ")})` }, actor.id);
      }
      return after;
    });
    kickReassessments();
    return result;
  } catch (error) {
    rethrowConstraint(error, CAS_UNIQUE);
  }
}

/** Retired substances stay for existing containers and findings but cannot be chosen for new ones. */
export function setSubstanceRetired(actor: SessionUser, id: number, retired: boolean): Substance {
  return getDb().transaction((tx) => {
    const before = tx.select().from(substances).where(eq(substances.id, id)).get();
    if (!before) throw new NotFoundError("That substance");
    if ((before.retiredAt != null) === retired) {
      throw new ConflictError(retired ? "That substance is already retired." : "That substance is not retired.");
    }
    const retiredAt = retired ? new Date() : null;
    const after = tx.update(substances).set({ retiredAt, updatedAt: new Date(), updatedById: actor.id }).where(eq(substances.id, id)).returning().get();
    recordAudit(tx, actor, {
      action: retired ? "retire" : "restore",
      entityType: "substance",
      entityId: id,
      summary: `${retired ? "Retired" : "Restored"} ${before.name} ${retired ? "from" : "to"} the substance library`,
      before: { retiredAt: before.retiredAt?.toISOString() ?? null },
      after: { retiredAt: retiredAt?.toISOString() ?? null },
    });
    return after;
  });
}
