import "server-only";
import { getIronSession, unsealData, type SessionOptions } from "iron-session";
import { cookies } from "next/headers";
import { cookieSecure, sessionSecret } from "@/lib/config";
import { findActiveUserForSession } from "@/db/queries/users";
import type { Role } from "@/db/schema";

export const SESSION_COOKIE = "headroom_session";
const SESSION_TTL_SECONDS = 60 * 60 * 12;

export type SessionData = { userId?: number; version?: number };

/** The signed-in person as every permission check sees them. */
export type SessionUser = { id: number; email: string; name: string; role: Role };

export function sessionOptions(): SessionOptions {
  return {
    cookieName: SESSION_COOKIE,
    password: sessionSecret(),
    ttl: SESSION_TTL_SECONDS,
    cookieOptions: { httpOnly: true, sameSite: "lax", secure: cookieSecure(), path: "/" },
  };
}

async function userFromSessionData(data: SessionData): Promise<SessionUser | null> {
  if (!data.userId || !data.version) return null;
  return findActiveUserForSession(data.userId, data.version);
}

/** For server components and server actions (reads the request's cookies). */
export async function getSessionUser(): Promise<SessionUser | null> {
  const session = await getIronSession<SessionData>(await cookies(), sessionOptions());
  return userFromSessionData(session);
}

export async function startSession(user: { id: number; sessionVersion: number }): Promise<void> {
  const session = await getIronSession<SessionData>(await cookies(), sessionOptions());
  session.userId = user.id;
  session.version = user.sessionVersion;
  await session.save();
}

export async function endSession(): Promise<void> {
  const session = await getIronSession<SessionData>(await cookies(), sessionOptions());
  session.destroy();
}

/** For route handlers: reads the cookie from the request itself (no request-scoped APIs). */
export async function getRequestUser(request: Request): Promise<SessionUser | null> {
  const header = request.headers.get("cookie");
  if (!header) return null;
  const sealed = header
    .split(";")
    .map((part) => part.trim())
    .find((part) => part.startsWith(`${SESSION_COOKIE}=`))
    ?.slice(SESSION_COOKIE.length + 1);
  if (!sealed) return null;
  try {
    const data = await unsealData<SessionData>(decodeURIComponent(sealed), {
      password: sessionSecret(),
      ttl: SESSION_TTL_SECONDS,
    });
    return userFromSessionData(data);
  } catch {
    return null;
  }
}

/** Writes (or clears) the session cookie on a route handler's response. */
export async function writeSessionCookie(
  request: Request,
  response: Response,
  user: { id: number; sessionVersion: number } | null,
): Promise<void> {
  const session = await getIronSession<SessionData>(request, response, sessionOptions());
  if (user) {
    session.userId = user.id;
    session.version = user.sessionVersion;
    await session.save();
  } else {
    session.destroy();
  }
}
