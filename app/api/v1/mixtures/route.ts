import { NextResponse } from "next/server";
import { getMixture, listMixtures } from "@/db/queries/mixtures";
import { listPage } from "@/lib/http/list-query";
import { route } from "@/lib/http/route";
import { mixtureCreateSchema, mixtureListQuerySchema } from "@/lib/mixtures/schemas";
import { createMixture } from "@/lib/mixtures/service";

/** Defines a mixture by its components' mass or mole fractions (summing to 1 within ±0.005). */
export const POST = route({ action: "mixtures.write", schema: mixtureCreateSchema }, ({ user, input }) =>
  NextResponse.json({ data: getMixture(createMixture(user, input).id) }, { status: 201 }),
);

export const GET = route({ action: "inventory.read", schema: mixtureListQuerySchema }, ({ input }) => {
  const { rows, total } = listMixtures(input);
  return NextResponse.json(listPage(input, rows, total));
});
