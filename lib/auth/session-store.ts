import "server-only";
import { createHash, randomBytes } from "node:crypto";
import { and, count, desc, eq, gt, lt, ne, or, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { sessions, users } from "@/db/schema";
import { recordAudit } from "@/lib/audit/record";
import { sessionIdleMs, sessionMaxMs } from "@/lib/config";
import { NotFoundError } from "@/lib/errors";
import { writeGateRaised } from "@/lib/workers/write-gate";
import type { Role } from "./roles";

/**
 * Sessions recorded server-side: the cookie carries a random token, the `sessions` row its
 * SHA-256, the user, when it began and was last used, and from where. Every lookup checks the row
 * exists, is within the idle timeout and the absolute lifetime, and that the user is active with
 * the session_version the session began with.
 */

/** last_seen_at is written at most this often per session (no write per request). */
export const LAST_SEEN_RESOLUTION_MS = 60_000;

export type SessionMeta = { userAgent: string | null; ip: string | null };

/** The signed-in person as every permission check sees them; `sessionId` is the row behind the cookie. */
export type SessionUser = { id: number; email: string; name: string; role: Role; sessionId?: number };

export function hashSessionToken(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}

/** Starts a session for a user who just proved who they are; returns the token for the cookie. */
export function createSession(user: { id: number; sessionVersion: number }, meta: SessionMeta, now = Date.now()): string {
  const token = randomBytes(32).toString("base64url");
  getDb()
    .insert(sessions)
    .values({
      tokenHash: hashSessionToken(token),
      userId: user.id,
      sessionVersion: user.sessionVersion,
      createdAt: new Date(now),
      lastSeenAt: new Date(now),
      userAgent: meta.userAgent?.slice(0, 400) ?? null,
      ip: meta.ip?.slice(0, 64) ?? null,
    })
    .run();
  return token;
}

function live(now: number) {
  return and(
    gt(sessions.lastSeenAt, new Date(now - sessionIdleMs())),
    gt(sessions.createdAt, new Date(now - sessionMaxMs())),
    eq(users.active, true),
    eq(users.sessionVersion, sessions.sessionVersion),
  );
}

/** The user behind a session token, or null when the session has ended for any reason. */
export function resolveSession(token: string, now = Date.now()): SessionUser | null {
  const db = getDb();
  const row = db
    .select({
      sessionId: sessions.id,
      lastSeenAt: sessions.lastSeenAt,
      id: users.id,
      email: users.email,
      name: users.name,
      role: users.role,
    })
    .from(sessions)
    .innerJoin(users, eq(users.id, sessions.userId))
    .where(and(eq(sessions.tokenHash, hashSessionToken(token)), live(now)))
    .get();
  if (!row) return null;
  // A write that can wait: skipped while a worker is inside a long write (the next request makes it).
  if (now - row.lastSeenAt.getTime() >= LAST_SEEN_RESOLUTION_MS && !writeGateRaised()) {
    db.update(sessions).set({ lastSeenAt: new Date(now) }).where(eq(sessions.id, row.sessionId)).run();
  }
  return { id: row.id, email: row.email, name: row.name, role: row.role, sessionId: row.sessionId };
}

/** Signing out: the session's row goes at once, so the cookie stops working everywhere. */
export function deleteSessionByToken(token: string): { userId: number } | null {
  const db = getDb();
  return db.transaction((tx) => {
    const row = tx.delete(sessions).where(eq(sessions.tokenHash, hashSessionToken(token))).returning({ userId: sessions.userId, id: sessions.id }).get();
    if (!row) return null;
    const user = tx.select({ id: users.id, email: users.email }).from(users).where(eq(users.id, row.userId)).get();
    if (user) recordAudit(tx, user, { action: "sign_out", entityType: "session", entityId: row.id, summary: `${user.email} signed out` });
    return { userId: row.userId };
  });
}

export type SessionListRow = {
  id: number;
  createdAt: Date;
  lastSeenAt: Date;
  userAgent: string | null;
  ip: string | null;
  current: boolean;
};

/** A user's sessions that still work, the most recently used first. */
export function listSessions(userId: number, currentSessionId: number | undefined, now = Date.now()): SessionListRow[] {
  return getDb()
    .select({ id: sessions.id, createdAt: sessions.createdAt, lastSeenAt: sessions.lastSeenAt, userAgent: sessions.userAgent, ip: sessions.ip })
    .from(sessions)
    .innerJoin(users, eq(users.id, sessions.userId))
    .where(and(eq(sessions.userId, userId), live(now)))
    .orderBy(desc(sessions.lastSeenAt), desc(sessions.id))
    .all()
    .map((row) => ({ ...row, current: row.id === currentSessionId }));
}

/** How many sessions that still work each user has (the administrators' list of people). */
export function countLiveSessionsByUser(now = Date.now()): Map<number, number> {
  const rows = getDb()
    .select({ userId: sessions.userId, n: count() })
    .from(sessions)
    .innerJoin(users, eq(users.id, sessions.userId))
    .where(live(now))
    .groupBy(sessions.userId)
    .all();
  return new Map(rows.map((r) => [r.userId, r.n]));
}

type Actor = { id: number; email: string };

/** "Sign out everywhere else": every session of the actor but the current one ends. */
export function endOtherSessions(actor: Actor & { sessionId?: number }): number {
  return getDb().transaction((tx) => {
    const ended = tx
      .delete(sessions)
      .where(and(eq(sessions.userId, actor.id), actor.sessionId ? ne(sessions.id, actor.sessionId) : undefined))
      .returning({ id: sessions.id })
      .all();
    recordAudit(tx, actor, {
      action: "end_sessions",
      entityType: "user",
      entityId: actor.id,
      summary: `${actor.email} signed out everywhere else (${ended.length} session${ended.length === 1 ? "" : "s"})`,
      after: { ended: ended.map((s) => s.id) },
    });
    return ended.length;
  });
}

/** Ends one of the actor's own sessions; another user's session id answers 404, like a missing one. */
export function endOwnSession(actor: Actor, sessionId: number): void {
  getDb().transaction((tx) => {
    const ended = tx
      .delete(sessions)
      .where(and(eq(sessions.id, sessionId), eq(sessions.userId, actor.id)))
      .returning({ id: sessions.id })
      .get();
    if (!ended) throw new NotFoundError("That session");
    recordAudit(tx, actor, {
      action: "end_session",
      entityType: "session",
      entityId: sessionId,
      summary: `${actor.email} ended one of their sessions`,
    });
  });
}

/** An administrator ends every session of a user (a lost laptop, a departure). */
export function endAllSessionsOf(actor: Actor, userId: number): number {
  return getDb().transaction((tx) => {
    const user = tx.select({ id: users.id, email: users.email }).from(users).where(eq(users.id, userId)).get();
    if (!user) throw new NotFoundError("That user");
    const ended = tx.delete(sessions).where(eq(sessions.userId, userId)).returning({ id: sessions.id }).all();
    recordAudit(tx, actor, {
      action: "end_sessions",
      entityType: "user",
      entityId: userId,
      summary: `Signed ${user.email} out everywhere (${ended.length} session${ended.length === 1 ? "" : "s"})`,
      after: { ended: ended.map((s) => s.id) },
    });
    return ended.length;
  });
}

/** Deletes the rows of sessions that can no longer be used: idle, too old, or of a changed or deactivated user. */
export function sweepSessions(now = Date.now()): number {
  const stale = sql`(select 1 from ${users} where ${users.id} = ${sessions.userId} and ${users.active} = 1 and ${users.sessionVersion} = ${sessions.sessionVersion})`;
  return getDb()
    .delete(sessions)
    .where(
      or(
        lt(sessions.lastSeenAt, new Date(now - sessionIdleMs())),
        lt(sessions.createdAt, new Date(now - sessionMaxMs())),
        sql`not exists ${stale}`,
      ),
    )
    .run().changes;
}
