import { NextResponse } from "next/server";
import { getSubstance } from "@/db/queries/substances";
import { DomainError, NotFoundError } from "@/lib/errors";
import { HazardInputError } from "@/lib/hazard";
import { idParam } from "@/lib/http/paging";
import { route } from "@/lib/http/route";
import { vaporPressureQuerySchema } from "@/lib/substances/schemas";
import { vaporAt } from "@/lib/substances/vapor";

/** Saturation vapor pressure and saturated concentration of one substance at tempC. */
export const GET = route({ action: "substances.read", schema: vaporPressureQuerySchema }, ({ params, input }) => {
  const id = idParam(params.id);
  const row = id ? getSubstance(id) : null;
  if (!row) throw new NotFoundError("That substance");
  try {
    return NextResponse.json({ substanceId: row.id, ...vaporAt(row, input.tempC, input.ambientPressureKPa) });
  } catch (error) {
    if (error instanceof HazardInputError) {
      throw new DomainError("insufficient_data", `${row.name}: ${error.message}`, 422);
    }
    throw error;
  }
});
