import { NextResponse } from "next/server";
import { getMixture } from "@/db/queries/mixtures";
import { route } from "@/lib/http/route";
import { mixtureCreateSchema } from "@/lib/mixtures/schemas";
import { createMixture } from "@/lib/mixtures/service";

/** Defines a mixture by its components' mass or mole fractions (summing to 1 within ±0.005). */
export const POST = route({ action: "mixtures.write", schema: mixtureCreateSchema }, ({ user, input }) =>
  NextResponse.json({ data: getMixture(createMixture(user, input).id) }, { status: 201 }),
);
