import { NextResponse } from "next/server";
import { listFindingsPage } from "@/db/queries/findings";
import { listPage } from "@/lib/http/list-query";
import { route } from "@/lib/http/route";
import { findingListQuerySchema } from "@/lib/register/schemas";

/**
 * The register: `?severity=&status=&siteId=&roomId=&storageUnitId=&rule=&page=&pageSize=`
 * (severity and status take comma-separated lists) → `{ data, page, pageSize, total }`.
 * Researchers and facilities see the findings on what they own or look after.
 */
export const GET = route({ action: "findings.read", schema: findingListQuerySchema }, ({ user, scope, input }) => {
  const { rows, total } = listFindingsPage(user, scope, input);
  return NextResponse.json(listPage(input, rows, total));
});
