import { NextResponse } from "next/server";
import { route } from "@/lib/http/route";
import { sensorCreateSchema } from "@/lib/temperatures/schemas";
import { createSensor, listSensorRows } from "@/lib/temperatures/sensors";

export const GET = route({ action: "temperatures.read" }, () => {
  const data = listSensorRows();
  return NextResponse.json({ data, page: 1, pageSize: data.length, total: data.length });
});

/** Registers a logger by its device id, attached to one room or one storage unit. */
export const POST = route({ action: "sensors.write", schema: sensorCreateSchema }, ({ user, input }) =>
  NextResponse.json({ data: createSensor(user, input) }, { status: 201 }),
);
