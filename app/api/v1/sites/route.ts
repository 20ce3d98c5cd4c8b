import { NextResponse } from "next/server";
import { route } from "@/lib/http/route";
import { siteCreateSchema } from "@/lib/locations/schemas";
import { createSite } from "@/lib/locations/service";

export const POST = route({ action: "locations.write", schema: siteCreateSchema }, ({ user, input }) =>
  NextResponse.json({ data: createSite(user, input) }, { status: 201 }),
);
