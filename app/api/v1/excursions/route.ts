import { NextResponse } from "next/server";
import { route } from "@/lib/http/route";
import { listExcursions } from "@/lib/temperatures/queries";
import { excursionListQuerySchema } from "@/lib/temperatures/schemas";

/** Excursions, open ones first then newest first; filter by sensor, room, room with its units, unit, open or awaiting acknowledgement. */
export const GET = route({ action: "temperatures.read", schema: excursionListQuerySchema }, ({ input }) => {
  const data = listExcursions({
    sensorId: input.sensorId ?? undefined,
    roomId: input.roomId ?? undefined,
    inRoomId: input.inRoomId ?? undefined,
    storageUnitId: input.storageUnitId ?? undefined,
    open: input.open === "true" ? true : undefined,
    awaitingAcknowledgement: input.awaitingAcknowledgement === "true" ? true : undefined,
    limit: input.limit,
  });
  return NextResponse.json({ data });
});
