import { NextResponse } from "next/server";
import { getFinding } from "@/db/queries/findings";
import { NotFoundError } from "@/lib/errors";
import { requireId } from "@/lib/http/params";
import { route } from "@/lib/http/route";

/** One finding with its calculation trace and its history of events. */
export const GET = route({ action: "findings.read" }, ({ user, scope, params }) => {
  const found = getFinding(user, scope, requireId(params, "That finding"));
  if (!found) throw new NotFoundError("No such finding, or it is not on a location you look after.");
  const { finding, events } = found;
  return NextResponse.json({
    data: {
      ...finding,
      limit: finding.limitValue,
      events: events.map((e) => ({ ...e, actor: e.actorId ? { id: e.actorId, name: e.actorName } : null })),
    },
  });
});
