import { NextResponse } from "next/server";
import { getStorageUnit } from "@/db/queries/location-details";
import { route } from "@/lib/http/route";
import { storageUnitCreateSchema } from "@/lib/locations/schemas";
import { createStorageUnit } from "@/lib/locations/service";

export const POST = route({ action: "locations.write", schema: storageUnitCreateSchema }, ({ user, input }) =>
  NextResponse.json({ data: getStorageUnit(createStorageUnit(user, input).id) }, { status: 201 }),
);
