import { NextResponse } from "next/server";
import { listSites } from "@/db/queries/location-lists";
import { listPage } from "@/lib/http/list-query";
import { route } from "@/lib/http/route";
import { siteCreateSchema, siteListQuerySchema } from "@/lib/locations/schemas";
import { createSite } from "@/lib/locations/service";

export const POST = route({ action: "locations.write", schema: siteCreateSchema }, ({ user, input }) =>
  NextResponse.json({ data: createSite(user, input) }, { status: 201 }),
);

export const GET = route({ action: "locations.read", schema: siteListQuerySchema }, ({ input }) => {
  const { rows, total } = listSites(input);
  return NextResponse.json(listPage(input, rows, total));
});
