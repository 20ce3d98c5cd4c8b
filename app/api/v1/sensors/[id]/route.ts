import { NextResponse } from "next/server";
import { NotFoundError } from "@/lib/errors";
import { requireId } from "@/lib/http/params";
import { route } from "@/lib/http/route";
import { sensorUpdateSchema } from "@/lib/temperatures/schemas";
import { getSensor, updateSensor } from "@/lib/temperatures/sensors";

export const GET = route({ action: "temperatures.read" }, ({ params }) => {
  const sensor = getSensor(requireId(params, "That sensor"));
  if (!sensor) throw new NotFoundError("That sensor");
  return NextResponse.json({ data: sensor });
});

/** Rename, change the device id, move (`roomId` or `storageUnitId`) or switch off/on (`active`). */
export const PATCH = route({ action: "sensors.write", schema: sensorUpdateSchema }, ({ params, user, input }) => {
  const id = requireId(params, "That sensor");
  updateSensor(user, id, input);
  return NextResponse.json({ data: getSensor(id) });
});
