import { NextResponse } from "next/server";
import { getRoom } from "@/db/queries/location-details";
import { listRooms } from "@/db/queries/location-lists";
import { listPage } from "@/lib/http/list-query";
import { route } from "@/lib/http/route";
import { roomCreateSchema, roomListQuerySchema } from "@/lib/locations/schemas";
import { createRoom } from "@/lib/locations/service";

export const POST = route({ action: "locations.write", schema: roomCreateSchema }, ({ user, input }) =>
  NextResponse.json({ data: getRoom(createRoom(user, input).id) }, { status: 201 }),
);

export const GET = route({ action: "locations.read", schema: roomListQuerySchema }, ({ input }) => {
  const { rows, total } = listRooms(input);
  return NextResponse.json(listPage(input, rows, total));
});
