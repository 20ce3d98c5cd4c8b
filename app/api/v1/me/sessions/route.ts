import { NextResponse } from "next/server";
import { endOtherSessions, listSessions, type SessionListRow } from "@/lib/auth/session-store";
import { describeUserAgent } from "@/lib/format/user-agent";
import { route } from "@/lib/http/route";

function sessionJson(row: SessionListRow) {
  return {
    id: row.id,
    createdAt: row.createdAt.toISOString(),
    lastSeenAt: row.lastSeenAt.toISOString(),
    userAgent: row.userAgent,
    device: describeUserAgent(row.userAgent),
    ip: row.ip,
    current: row.current,
  };
}

/** One's own sessions that still work, most recently used first; `current` marks this one. */
export const GET = route({ action: "sessions.own" }, ({ user }) => {
  const data = listSessions(user.id, user.sessionId).map(sessionJson);
  return NextResponse.json({ data });
});

/** Signs out everywhere else: every own session but this one ends. */
export const DELETE = route({ action: "sessions.own" }, ({ user }) => {
  const ended = endOtherSessions(user);
  return NextResponse.json({ ended });
});
