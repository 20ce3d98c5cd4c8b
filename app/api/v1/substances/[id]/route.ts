import { NextResponse } from "next/server";
import { getSubstance } from "@/db/queries/substances";
import { NotFoundError } from "@/lib/errors";
import { idParam } from "@/lib/http/paging";
import { route } from "@/lib/http/route";
import { substanceDetail } from "@/lib/substances/present";

export const GET = route({ action: "substances.read" }, ({ params }) => {
  const id = idParam(params.id);
  const row = id ? getSubstance(id) : null;
  if (!row) throw new NotFoundError("That substance");
  return NextResponse.json({ data: substanceDetail(row) });
});
