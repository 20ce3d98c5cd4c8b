import { NextResponse } from "next/server";
import { endAllSessionsOf } from "@/lib/auth/session-store";
import { requireId } from "@/lib/http/params";
import { route } from "@/lib/http/route";

/** An administrator signs a person out everywhere; their next request needs a new sign-in. */
export const DELETE = route({ action: "users.endSessions" }, ({ user, params }) => {
  const ended = endAllSessionsOf(user, requireId(params, "That user"));
  return NextResponse.json({ ended });
});
