import { NextResponse } from "next/server";
import { getRoom } from "@/db/queries/location-details";
import { route } from "@/lib/http/route";
import { roomCreateSchema } from "@/lib/locations/schemas";
import { createRoom } from "@/lib/locations/service";

export const POST = route({ action: "locations.write", schema: roomCreateSchema }, ({ user, input }) =>
  NextResponse.json({ data: getRoom(createRoom(user, input).id) }, { status: 201 }),
);
