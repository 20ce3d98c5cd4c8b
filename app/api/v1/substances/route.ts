import { NextResponse } from "next/server";
import { listSubstances } from "@/db/queries/substances";
import { route } from "@/lib/http/route";
import { substanceSummary } from "@/lib/substances/present";
import { substanceListQuerySchema } from "@/lib/substances/schemas";

export const GET = route({ action: "substances.read", schema: substanceListQuerySchema }, ({ input }) => {
  const { rows, total } = listSubstances(input);
  return NextResponse.json({ data: rows.map(substanceSummary), page: input.page, pageSize: input.pageSize, total });
});
