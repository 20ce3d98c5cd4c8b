import { NextResponse } from "next/server";
import { getSubstance } from "@/db/queries/substances";
import { NotFoundError } from "@/lib/errors";
import { idParam } from "@/lib/http/paging";
import { route } from "@/lib/http/route";
import { substanceDetail } from "@/lib/substances/present";
import { substanceUpdateSchema } from "@/lib/substances/schemas";
import { setSubstanceRetired, updateSubstance } from "@/lib/substances/service";

export const GET = route({ action: "substances.read" }, ({ params }) => {
  const id = idParam(params.id);
  const row = id ? getSubstance(id) : null;
  if (!row) throw new NotFoundError("That substance");
  return NextResponse.json({ data: substanceDetail(row) });
});

function detailOf(id: number) {
  return NextResponse.json({ data: substanceDetail(getSubstance(id)!) });
}

/** Replaces the substance's values (safety officers); every value with a source; audited. */
export const PATCH = route({ action: "substances.write", schema: substanceUpdateSchema }, ({ params, user, input }) => {
  const id = idParam(params.id);
  if (!id) throw new NotFoundError("That substance");
  updateSubstance(user, id, input);
  return detailOf(id);
});

/** Retires the substance: it stays for existing containers and findings. */
export const DELETE = route({ action: "substances.write" }, ({ params, user }) => {
  const id = idParam(params.id);
  if (!id) throw new NotFoundError("That substance");
  setSubstanceRetired(user, id, true);
  return detailOf(id);
});
