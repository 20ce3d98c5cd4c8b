import "server-only";
import type { Db } from "@/db/client";
import { refreshSubstanceLibrary, SUBSTANCE_LIBRARY_EDITION } from "@/db/seed/substances";
import { allRoomIds, queueReassessment } from "@/lib/assessment/jobs";
import { recordAudit } from "@/lib/audit/record";
import { log } from "@/lib/log";

/**
 * At start: brings the installation's library substances up to the library's edition (once per
 * edition; substances a person edited keep their values), records it in the audit log and queues a
 * re-assessment of every room, since values such as densities may have changed. One transaction.
 */
export function applySubstanceLibraryEdition(db: Db): number[] | null {
  const refreshed = db.transaction((tx) => {
    const ids = refreshSubstanceLibrary(tx);
    if (!ids || ids.length === 0) return ids;
    recordAudit(tx, { system: "substance library" }, {
      action: "update",
      entityType: "substance",
      summary: `Substance library brought up to its ${SUBSTANCE_LIBRARY_EDITION} edition: ${ids.length} substance${ids.length === 1 ? "" : "s"} nobody had edited took the library's values and sources`,
      after: { edition: SUBSTANCE_LIBRARY_EDITION, substances: ids.length },
    });
    queueReassessment(tx, { roomIds: allRoomIds(tx), reason: `substance library ${SUBSTANCE_LIBRARY_EDITION} edition` }, null);
    return ids;
  });
  if (refreshed?.length) log.info({ edition: SUBSTANCE_LIBRARY_EDITION, substances: refreshed.length }, "substance library refreshed");
  return refreshed;
}
