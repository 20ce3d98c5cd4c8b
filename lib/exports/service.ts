import "server-only";
import { PassThrough, Readable } from "node:stream";
import { getDb } from "@/db/client";
import { findSite } from "@/db/queries/register-export";
import { recordAudit } from "@/lib/audit/record";
import type { SessionUser } from "@/lib/auth/session";
import { ValidationError } from "@/lib/errors";
import { log } from "@/lib/log";
import { registerWorkbookFileName, writeRegisterWorkbook } from "./register-workbook";
import { ExportCancelledError } from "./table-sheet";

/**
 * Starts a download of the register workbook: checks the site, records the download in the audit
 * log, then streams the workbook as it is written. A failure after the first bytes can only cut
 * the download short (the headers are gone), so it is logged and the stream is aborted.
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
  const output = new PassThrough();
  const startedAt = performance.now();
  writeRegisterWorkbook(output, { siteId: site?.id, generatedBy: `${user.name} <${user.email}>`, nowMs }).then(
    (counts) => log.info({ userId: user.id, siteId: site?.id ?? null, ms: Math.round(performance.now() - startedAt), ...counts }, "register workbook written"),
    (error) => {
      if (error instanceof ExportCancelledError) log.info({ userId: user.id }, "register workbook download cancelled");
      else log.error({ err: error, userId: user.id }, "register workbook failed while streaming");
      output.destroy(error instanceof Error ? error : new Error(String(error)));
    },
  );
  return { body: Readable.toWeb(output) as ReadableStream<Uint8Array>, fileName };
}
