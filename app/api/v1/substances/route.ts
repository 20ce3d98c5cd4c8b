import { NextResponse } from "next/server";
import { listSubstances } from "@/db/queries/substances";
import { listPage } from "@/lib/http/list-query";
import { route } from "@/lib/http/route";
import { substanceSummary } from "@/lib/substances/present";
import { substanceListQuerySchema } from "@/lib/substances/schemas";

export const GET = route({ action: "substances.read", schema: substanceListQuerySchema }, ({ input }) => {
  const { rows, total } = listSubstances(input);
  return NextResponse.json(listPage(input, rows.map(substanceSummary), total));
});
