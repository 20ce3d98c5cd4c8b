import { NextResponse } from "next/server";
import { listPage } from "@/lib/http/list-query";
import { route } from "@/lib/http/route";
import { sensorCreateSchema, sensorListQuerySchema } from "@/lib/temperatures/schemas";
import { createSensor, listSensors } from "@/lib/temperatures/sensors";

/** The sensors, paged: `q` (device id or name), `status` (on/off), `excursion=open`; sort by externalId, name, location or lastReadingAt. */
export const GET = route({ action: "temperatures.read", schema: sensorListQuerySchema }, ({ input }) => {
  const { rows, total } = listSensors(input);
  return NextResponse.json(listPage(input, rows, total));
});

/** Registers a logger by its device id, attached to one room or one storage unit. */
export const POST = route({ action: "sensors.write", schema: sensorCreateSchema }, ({ user, input }) =>
  NextResponse.json({ data: createSensor(user, input) }, { status: 201 }),
);
