import { NextResponse } from "next/server";
import { listFindingsPage } from "@/db/queries/findings";
import { listPage } from "@/lib/http/list-query";
import { route } from "@/lib/http/route";
import { findingListQuerySchema } from "@/lib/register/schemas";

/**
 * The register, every finding on its own: `?severity=&status=&scenario=&rule=&siteId=&roomId=&storageUnitId=
 * &containerId=&substanceId=&mine=true&q=&page=&pageSize=` (severity, status and scenario take
 * comma-separated lists) → `{ data, page, pageSize, total }`. `roomId` includes the room's units'
 * findings; `containerId` gives the findings that container contributes to; `mine=true` those
 * touching the caller's own containers; `q` matches the title and room and unit codes. Each row
 * carries its `fingerprint`: rows that differ only in their last part (the scenario) are one problem.
 * Researchers and facilities see the findings on what they own or look after.
 */
export const GET = route({ action: "findings.read", schema: findingListQuerySchema }, ({ user, scope, input }) => {
  const { rows, total } = listFindingsPage(user, scope, input);
  return NextResponse.json(listPage(input, rows, total));
});
