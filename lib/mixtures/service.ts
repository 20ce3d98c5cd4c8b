import "server-only";
import { inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { mixtureComponents, mixtures, substances, type Mixture } from "@/db/schema";
import { recordAudit } from "@/lib/audit/record";
import type { SessionUser } from "@/lib/auth/session";
import { rethrowConstraint } from "@/lib/db-errors";
import { ValidationError } from "@/lib/errors";
import type { MixtureInput } from "./schemas";

const NAME_UNIQUE = { "mixtures.name": { field: "name", message: "A mixture with this name already exists." } };

export function createMixture(actor: SessionUser, input: MixtureInput): Mixture {
  try {
    return getDb().transaction((tx) => {
      const ids = input.components.map((c) => c.substanceId);
      const found = tx.select({ id: substances.id, name: substances.name, retiredAt: substances.retiredAt }).from(substances).where(inArray(substances.id, ids)).all();
      input.components.forEach((component, index) => {
        const row = found.find((s) => s.id === component.substanceId);
        if (!row || row.retiredAt) {
          throw new ValidationError("Choose substances from the library.", { [`components.${index}.substanceId`]: ["Choose a substance from the library."] });
        }
      });
      const mixture = tx
        .insert(mixtures)
        .values({ name: input.name, description: input.description ?? null, fractionBasis: input.fractionBasis, createdById: actor.id })
        .returning()
        .get();
      tx.insert(mixtureComponents).values(input.components.map((c) => ({ mixtureId: mixture.id, substanceId: c.substanceId, fraction: c.fraction }))).run();
      const recipe = input.components.map((c) => `${found.find((s) => s.id === c.substanceId)!.name} ${c.fraction}`).join(", ");
      recordAudit(tx, actor, {
        action: "create",
        entityType: "mixture",
        entityId: mixture.id,
        summary: `Defined mixture ${mixture.name} (${input.fractionBasis} fractions: ${recipe})`,
        after: { ...input },
      });
      return mixture;
    });
  } catch (error) {
    rethrowConstraint(error, NAME_UNIQUE);
  }
}
