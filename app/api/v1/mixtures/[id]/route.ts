import { NextResponse } from "next/server";
import { getMixture } from "@/db/queries/mixtures";
import { NotFoundError } from "@/lib/errors";
import { requireId } from "@/lib/http/params";
import { route } from "@/lib/http/route";

export const GET = route({ action: "inventory.read" }, ({ params }) => {
  const mixture = getMixture(requireId(params, "That mixture"));
  if (!mixture) throw new NotFoundError("That mixture");
  return NextResponse.json({ data: mixture });
});
