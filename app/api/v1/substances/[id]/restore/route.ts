import { NextResponse } from "next/server";
import { getSubstance } from "@/db/queries/substances";
import { requireId } from "@/lib/http/params";
import { route } from "@/lib/http/route";
import { substanceDetail } from "@/lib/substances/present";
import { setSubstanceRetired } from "@/lib/substances/service";

/** Brings a retired substance back into the library. */
export const POST = route({ action: "substances.write" }, ({ params, user }) => {
  const id = requireId(params, "That substance");
  setSubstanceRetired(user, id, false);
  return NextResponse.json({ data: substanceDetail(getSubstance(id)!) });
});
