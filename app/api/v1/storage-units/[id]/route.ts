import { NextResponse } from "next/server";
import { getStorageUnit } from "@/db/queries/location-details";
import { NotFoundError } from "@/lib/errors";
import { requireId } from "@/lib/http/params";
import { route } from "@/lib/http/route";
import { storageUnitUpdateSchema } from "@/lib/locations/schemas";
import { retireStorageUnit, updateStorageUnit } from "@/lib/locations/service";

export const GET = route({ action: "locations.read" }, ({ params }) => {
  const unit = getStorageUnit(requireId(params, "That storage unit"));
  if (!unit) throw new NotFoundError("That storage unit");
  return NextResponse.json({ data: unit });
});

export const PATCH = route({ action: "locations.write", schema: storageUnitUpdateSchema }, ({ params, user, input }) =>
  NextResponse.json({ data: updateStorageUnit(user, requireId(params, "That storage unit"), input) }),
);

/** Retires the unit (units are never deleted: findings refer to them). */
export const DELETE = route({ action: "locations.write" }, ({ params, user }) =>
  NextResponse.json({ data: retireStorageUnit(user, requireId(params, "That storage unit")) }),
);
