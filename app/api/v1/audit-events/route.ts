import { NextResponse } from "next/server";
import { listAuditEvents } from "@/db/queries/audit";
import { auditListQuerySchema } from "@/lib/audit/schemas";
import { listPage } from "@/lib/http/list-query";
import { route } from "@/lib/http/route";

/** The audit log: who changed what, when, with before and after values (safety officers, auditors, admins). */
export const GET = route({ action: "audit.read", schema: auditListQuerySchema }, ({ input }) => {
  const { rows, total } = listAuditEvents(input);
  return NextResponse.json(listPage(input, rows, total));
});
