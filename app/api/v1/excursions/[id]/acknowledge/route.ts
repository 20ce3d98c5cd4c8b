import { NextResponse } from "next/server";
import { requireId } from "@/lib/http/params";
import { route } from "@/lib/http/route";
import { acknowledgeExcursion } from "@/lib/temperatures/excursion-store";
import { excursionAcknowledgeSchema } from "@/lib/temperatures/schemas";

/** Facilities (and safety officers, admins) acknowledge an excursion with a comment saying what was done. */
export const POST = route({ action: "excursions.acknowledge", schema: excursionAcknowledgeSchema }, ({ params, user, input }) => {
  const excursion = acknowledgeExcursion(user, requireId(params, "That excursion"), input.comment);
  return NextResponse.json({ data: excursion });
});
