import { NextResponse } from "next/server";
import { getRoom } from "@/db/queries/location-details";
import { NotFoundError } from "@/lib/errors";
import { requireId } from "@/lib/http/params";
import { route } from "@/lib/http/route";
import { roomUpdateSchema } from "@/lib/locations/schemas";
import { retireRoom, updateRoom } from "@/lib/locations/service";

export const GET = route({ action: "locations.read" }, ({ params }) => {
  const room = getRoom(requireId(params, "That room"));
  if (!room) throw new NotFoundError("That room");
  return NextResponse.json({ data: room });
});

export const PATCH = route({ action: "locations.write", schema: roomUpdateSchema }, ({ params, user, input }) =>
  NextResponse.json({ data: updateRoom(user, requireId(params, "That room"), input) }),
);

/** Retires the room (rooms are never deleted: findings refer to them). */
export const DELETE = route({ action: "locations.write" }, ({ params, user }) =>
  NextResponse.json({ data: retireRoom(user, requireId(params, "That room")) }),
);
