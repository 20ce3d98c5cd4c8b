import { registerExportQuerySchema } from "@/lib/exports/schemas";
import { startRegisterDownload } from "@/lib/exports/service";
import { route } from "@/lib/http/route";
import { limit } from "@/lib/rate-limit";

/** The register as an Excel workbook for audits, streamed (safety officers, auditors, admins); `?siteId=` for one site. */
export const GET = route({ action: "exports.download", schema: registerExportQuerySchema }, async ({ user, input }) => {
  await limit("exportUser", user.id);
  const { body, fileName } = startRegisterDownload(user, input);
  return new Response(body, {
    status: 200,
    headers: {
      "Content-Type": "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet",
      "Content-Disposition": `attachment; filename="${fileName}"`,
      "Cache-Control": "private, no-store",
      "X-Content-Type-Options": "nosniff",
    },
  });
});
