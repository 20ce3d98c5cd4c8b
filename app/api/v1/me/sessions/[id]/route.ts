import { NextResponse } from "next/server";
import { endOwnSession } from "@/lib/auth/session-store";
import { requireId } from "@/lib/http/params";
import { route } from "@/lib/http/route";

/** Ends one of one's own sessions (this one too, which signs out here); 404 for any other id. */
export const DELETE = route({ action: "sessions.own" }, ({ user, params }) => {
  endOwnSession(user, requireId(params, "That session"));
  return new NextResponse(null, { status: 204 });
});
