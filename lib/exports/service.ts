import "server-only";
import { MessageChannel } from "node:worker_threads";
import { getDb } from "@/db/client";
import { findSite } from "@/db/queries/register-export";
import { recordAudit } from "@/lib/audit/record";
import type { SessionUser } from "@/lib/auth/session";
import { ValidationError } from "@/lib/errors";
import { log } from "@/lib/log";
import { runTask } from "@/lib/workers/pool";
import { readableFromPort } from "@/lib/workers/port-stream";
import { registerWorkbookFileName } from "./register-workbook";
import { ExportCancelledError } from "./table-sheet";

/** A client that takes no bytes for this long is dropped: it would hold a worker thread. */
const STALLED_DOWNLOAD_MS = 2 * 60_000;

/**
 * Starts a download of the register workbook: checks the site, records the download in the audit
 * log, then streams the workbook as a worker thread writes it (lib/workers/port-stream.ts: the
 * worker runs at most a few MB ahead of the client; a client that goes away, or reads nothing for
 * STALLED_DOWNLOAD_MS, stops it). A failure after the first bytes can only cut the download short
 * (the headers are gone), so it is logged and the stream is aborted.
 */
export function startRegisterDownload(user: SessionUser, input: { siteId?: number }, nowMs = Date.now()): { body: ReadableStream<Uint8Array>; fileName: string } {
  const db = getDb();
  const site = input.siteId ? findSite(db, input.siteId) : null;
  if (input.siteId && !site) throw new ValidationError("No site has that id.", { siteId: ["No site has that id."] });
  const fileName = registerWorkbookFileName(nowMs);
  db.transaction((tx) =>
    recordAudit(tx, user, {
      action: "download",
      entityType: "export",
      entityId: "register.xlsx",
      summary: `Downloaded the register workbook (${site ? `site ${site.name}` : "all sites"})`,
      after: { fileName, siteId: site?.id ?? null },
    }),
  );
  const startedAt = performance.now();
  const { port1, port2 } = new MessageChannel();
  const body = readableFromPort(port1, { stallTimeoutMs: STALLED_DOWNLOAD_MS, onCancel: (reason) => log.info({ userId: user.id, reason }, "register workbook download cancelled") });
  runTask("exports.registerWorkbook", { port: port2, siteId: site?.id, generatedBy: `${user.name} <${user.email}>`, nowMs }, { transferList: [port2] }).then(
    (counts) => log.info({ userId: user.id, siteId: site?.id ?? null, ms: Math.round(performance.now() - startedAt), ...counts }, "register workbook written"),
    (error) => {
      // Ends the body with an error if it has not ended yet (a task refused before it started).
      port1.close();
      if (!(error instanceof ExportCancelledError)) log.error({ err: error, userId: user.id }, "register workbook failed while streaming");
    },
  );
  return { body, fileName };
}
