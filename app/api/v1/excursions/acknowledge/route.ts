import { NextResponse } from "next/server";
import { route } from "@/lib/http/route";
import { acknowledgeExcursions } from "@/lib/temperatures/excursion-store";
import { excursionsAcknowledgeSchema } from "@/lib/temperatures/schemas";

/**
 * Several excursions acknowledged at once with one note, in one transaction: each is checked on
 * its own and answered `{ excursionId, ok, error? }` in the order given.
 */
export const POST = route({ action: "excursions.acknowledge", schema: excursionsAcknowledgeSchema }, ({ user, input }) => {
  const data = acknowledgeExcursions(user, input.excursionIds, input.note ?? null);
  return NextResponse.json({ data });
});
