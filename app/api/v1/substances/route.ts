import { NextResponse } from "next/server";
import { getSubstance, listSubstances } from "@/db/queries/substances";
import { listPage } from "@/lib/http/list-query";
import { route } from "@/lib/http/route";
import { substanceDetail, substanceSummary } from "@/lib/substances/present";
import { substanceCreateSchema, substanceListQuerySchema } from "@/lib/substances/schemas";
import { createSubstance } from "@/lib/substances/service";

export const GET = route({ action: "substances.read", schema: substanceListQuerySchema }, ({ input }) => {
  const { rows, total } = listSubstances(input);
  return NextResponse.json(listPage(input, rows.map(substanceSummary), total));
});

/** Adds a substance to the library (safety officers); every value needs its source. */
export const POST = route({ action: "substances.write", schema: substanceCreateSchema }, ({ user, input }) => {
  const created = createSubstance(user, input);
  return NextResponse.json({ data: substanceDetail(getSubstance(created.id)!) }, { status: 201 });
});
