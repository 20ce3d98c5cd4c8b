import "server-only";
import { getIronSession, unsealData, type SessionOptions } from "iron-session";
import { cookies } from "next/headers";
import { cookieSecure, sessionMaxMs, sessionSecret } from "@/lib/config";
import { clientIp, currentClientIp, currentUserAgent } from "@/lib/http/client-ip";
import { createSession, deleteSessionByToken, resolveSession, type SessionMeta, type SessionUser } from "./session-store";

export type { SessionUser };

export const SESSION_COOKIE = "headroom_session";

/** The cookie holds only the session's token; the row in `sessions` says whether it still works. */
export type SessionData = { sid?: string };

function cookieTtlSeconds(): number {
  return Math.ceil(sessionMaxMs() / 1000);
}

export function sessionOptions(): SessionOptions {
  return {
    cookieName: SESSION_COOKIE,
    password: sessionSecret(),
    ttl: cookieTtlSeconds(),
    cookieOptions: { httpOnly: true, sameSite: "lax", secure: cookieSecure(), path: "/" },
  };
}

function userFromSessionData(data: SessionData): SessionUser | null {
  return data.sid ? resolveSession(data.sid) : null;
}

/** For server components and server actions (reads the request's cookies). */
export async function getSessionUser(): Promise<SessionUser | null> {
  const session = await getIronSession<SessionData>(await cookies(), sessionOptions());
  return userFromSessionData(session);
}

/** Server actions: records a new session and sets its cookie. */
export async function startSession(user: { id: number; sessionVersion: number }): Promise<void> {
  const session = await getIronSession<SessionData>(await cookies(), sessionOptions());
  session.sid = createSession(user, { userAgent: await currentUserAgent(), ip: await currentClientIp() });
  await session.save();
}

/** Server actions: deletes the session's row, then clears the cookie. */
export async function endSession(): Promise<void> {
  const session = await getIronSession<SessionData>(await cookies(), sessionOptions());
  if (session.sid) deleteSessionByToken(session.sid);
  session.destroy();
}

async function requestSessionData(request: Request): Promise<SessionData | null> {
  const header = request.headers.get("cookie");
  if (!header) return null;
  const sealed = header
    .split(";")
    .map((part) => part.trim())
    .find((part) => part.startsWith(`${SESSION_COOKIE}=`))
    ?.slice(SESSION_COOKIE.length + 1);
  if (!sealed) return null;
  try {
    return await unsealData<SessionData>(decodeURIComponent(sealed), { password: sessionSecret(), ttl: cookieTtlSeconds() });
  } catch {
    return null;
  }
}

/** For route handlers: reads the cookie from the request itself (no request-scoped APIs). */
export async function getRequestUser(request: Request): Promise<SessionUser | null> {
  const data = await requestSessionData(request);
  return data ? userFromSessionData(data) : null;
}

export function requestSessionMeta(request: Request): SessionMeta {
  return { userAgent: request.headers.get("user-agent"), ip: clientIp(request) };
}

/**
 * Route handlers: with a user, records a new session and sets its cookie on the response;
 * with null, deletes the request's session row (if any) and clears the cookie.
 */
export async function writeSessionCookie(
  request: Request,
  response: Response,
  user: { id: number; sessionVersion: number } | null,
): Promise<void> {
  const session = await getIronSession<SessionData>(request, response, sessionOptions());
  if (user) {
    session.sid = createSession(user, requestSessionMeta(request));
    await session.save();
  } else {
    if (session.sid) deleteSessionByToken(session.sid);
    session.destroy();
  }
}
