import { NextResponse } from "next/server";
import { getStorageUnit } from "@/db/queries/location-details";
import { listStorageUnits } from "@/db/queries/location-lists";
import { listPage } from "@/lib/http/list-query";
import { route } from "@/lib/http/route";
import { storageUnitCreateSchema, storageUnitListQuerySchema } from "@/lib/locations/schemas";
import { createStorageUnit } from "@/lib/locations/service";

export const POST = route({ action: "locations.write", schema: storageUnitCreateSchema }, ({ user, input }) =>
  NextResponse.json({ data: getStorageUnit(createStorageUnit(user, input).id) }, { status: 201 }),
);

export const GET = route({ action: "locations.read", schema: storageUnitListQuerySchema }, ({ input }) => {
  const { rows, total } = listStorageUnits(input);
  return NextResponse.json(listPage(input, rows, total));
});
