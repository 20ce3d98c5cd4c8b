import { NextResponse } from "next/server";
import { getSite } from "@/db/queries/location-details";
import { NotFoundError } from "@/lib/errors";
import { requireId } from "@/lib/http/params";
import { route } from "@/lib/http/route";
import { siteUpdateSchema } from "@/lib/locations/schemas";
import { updateSite } from "@/lib/locations/service";

export const GET = route({ action: "locations.read" }, ({ params }) => {
  const site = getSite(requireId(params, "That site"));
  if (!site) throw new NotFoundError("That site");
  return NextResponse.json({ data: site });
});

export const PATCH = route({ action: "locations.write", schema: siteUpdateSchema }, ({ params, user, input }) =>
  NextResponse.json({ data: updateSite(user, requireId(params, "That site"), input) }),
);
