/** Sessions recorded server-side: sign-out, idle and absolute expiry, listing, ending others', version changes. */
import { afterEach, describe, expect, it, vi } from "vitest";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { auditEvents, sessions, users } from "@/db/schema";
import * as sessionRoute from "@/app/api/v1/session/route";
import * as meRoute from "@/app/api/v1/me/route";
import * as mySessionsRoute from "@/app/api/v1/me/sessions/route";
import * as mySessionRoute from "@/app/api/v1/me/sessions/[id]/route";
import * as userSessionsRoute from "@/app/api/v1/users/[id]/sessions/route";
import { sweepSessions } from "@/lib/auth/session-store";
import { issueUserToken } from "@/lib/auth/tokens";
import { changeUserRole, setPasswordWithToken, setUserActive } from "@/lib/users/service";
import { call, makeUser, sessionCookieFor, TEST_PASSWORD } from "../helpers/world";

const FIREFOX = "Mozilla/5.0 (Windows NT 10.0; Win64; x64; rv:133.0) Gecko/20100101 Firefox/133.0";
const SAFARI_PHONE = "Mozilla/5.0 (iPhone; CPU iPhone OS 18_1 like Mac OS X) AppleWebKit/605.1.15 (KHTML, like Gecko) Version/18.1 Mobile/15E148 Safari/604.1";

const MINUTE = 60_000;
const HOUR = 60 * MINUTE;

async function signIn(email: string, userAgent = FIREFOX): Promise<string> {
  const response = await call(sessionRoute.POST, {
    method: "POST",
    path: "/api/v1/session",
    body: { email, password: TEST_PASSWORD },
    headers: { "user-agent": userAgent },
  });
  expect(response.status).toBe(200);
  return (response.headers.get("set-cookie") ?? "").split(";")[0];
}

const me = (cookie: string) => call(meRoute.GET, { path: "/api/v1/me", cookie });
const sessionRows = (userId: number) => getDb().select().from(sessions).where(eq(sessions.userId, userId)).all();

function actorOf(user: ReturnType<typeof makeUser>) {
  return { id: user.id, email: user.email, name: user.name, role: user.role };
}

afterEach(() => {
  vi.useRealTimers();
  delete process.env.SESSION_IDLE_MINUTES;
  delete process.env.SESSION_MAX_HOURS;
});

describe("signing out", () => {
  it("deletes the session at once: the old cookie answers 401 on GET /api/v1/me", async () => {
    const user = makeUser("researcher");
    const cookie = await signIn(user.email);
    expect((await me(cookie)).status).toBe(200);
    expect(sessionRows(user.id)).toHaveLength(1);

    const out = await call(sessionRoute.DELETE, { method: "DELETE", path: "/api/v1/session", cookie });
    expect(out.status).toBe(204);
    expect(out.headers.get("set-cookie")).toMatch(/^headroom_session=;/);
    expect(sessionRows(user.id)).toHaveLength(0);

    const replayed = await me(cookie);
    expect(replayed.status).toBe(401);
    expect(replayed.body).toEqual({ error: { code: "unauthenticated", message: "Sign in to continue." } });
    const audit = getDb().select().from(auditEvents).where(and(eq(auditEvents.action, "sign_out"), eq(auditEvents.actorId, user.id))).all();
    expect(audit).toHaveLength(1);
  });

  it("stores only a hash of the cookie's token, with the browser and address", async () => {
    const user = makeUser("auditor");
    const cookie = await signIn(user.email, SAFARI_PHONE);
    const [row] = sessionRows(user.id);
    expect(row.tokenHash).toMatch(/^[0-9a-f]{64}$/);
    expect(cookie).not.toContain(row.tokenHash);
    expect(row.userAgent).toBe(SAFARI_PHONE);
    expect(row.ip).toBe("unknown");
    expect(row.sessionVersion).toBe(user.sessionVersion);
  });
});

describe("expiry", () => {
  it("ends a session idle for longer than SESSION_IDLE_MINUTES (8 h by default); use keeps it going", async () => {
    vi.useFakeTimers({ toFake: ["Date"] });
    const user = makeUser("facilities");
    const cookie = await signIn(user.email);
    vi.advanceTimersByTime(8 * HOUR - MINUTE);
    expect((await me(cookie)).status).toBe(200);
    vi.advanceTimersByTime(8 * HOUR - MINUTE);
    expect((await me(cookie)).status).toBe(200);
    vi.advanceTimersByTime(8 * HOUR + MINUTE);
    expect((await me(cookie)).status).toBe(401);
  });

  it("follows SESSION_IDLE_MINUTES", async () => {
    vi.useFakeTimers({ toFake: ["Date"] });
    process.env.SESSION_IDLE_MINUTES = "30";
    const user = makeUser("researcher");
    const cookie = await signIn(user.email);
    vi.advanceTimersByTime(29 * MINUTE);
    expect((await me(cookie)).status).toBe(200);
    vi.advanceTimersByTime(31 * MINUTE);
    expect((await me(cookie)).status).toBe(401);
  });

  it("ends a session SESSION_MAX_HOURS after sign-in however busy it is", async () => {
    vi.useFakeTimers({ toFake: ["Date"] });
    const user = makeUser("safety_officer");
    const cookie = await signIn(user.email);
    process.env.SESSION_MAX_HOURS = "2";
    for (let minutes = 50; minutes <= 100; minutes += 50) {
      vi.advanceTimersByTime(50 * MINUTE);
      expect((await me(cookie)).status).toBe(200);
    }
    vi.advanceTimersByTime(21 * MINUTE);
    expect((await me(cookie)).status).toBe(401);
  });

  it("ends a session after 7 days by default", async () => {
    vi.useFakeTimers({ toFake: ["Date"] });
    const user = makeUser("auditor");
    const cookie = await signIn(user.email);
    // Used every 7 hours (within the idle timeout) for 161 hours, then once more at 168 h 1 min.
    for (let step = 1; step <= 23; step += 1) {
      vi.advanceTimersByTime(7 * HOUR);
      expect((await me(cookie)).status).toBe(200);
    }
    vi.advanceTimersByTime(7 * HOUR + MINUTE);
    expect((await me(cookie)).status).toBe(401);
  });

  it("writes last-seen at most once a minute", async () => {
    vi.useFakeTimers({ toFake: ["Date"] });
    const user = makeUser("researcher");
    const cookie = await signIn(user.email);
    const started = sessionRows(user.id)[0].lastSeenAt.getTime();
    vi.advanceTimersByTime(30_000);
    await me(cookie);
    expect(sessionRows(user.id)[0].lastSeenAt.getTime()).toBe(started);
    vi.advanceTimersByTime(31_000);
    await me(cookie);
    expect(sessionRows(user.id)[0].lastSeenAt.getTime()).toBe(started + 61_000);
  });

  it("sweeps rows of idle, too old and voided sessions, keeping the live ones", async () => {
    const now = Date.now();
    const live = makeUser("researcher");
    const idle = makeUser("researcher");
    const old = makeUser("researcher");
    const voided = makeUser("researcher");
    await sessionCookieFor(live, undefined, now - 7 * HOUR);
    getDb().update(sessions).set({ lastSeenAt: new Date(now - MINUTE) }).where(eq(sessions.userId, live.id)).run();
    await sessionCookieFor(idle, undefined, now - 9 * HOUR);
    await sessionCookieFor(old, undefined, now - 8 * 24 * HOUR);
    getDb().update(sessions).set({ lastSeenAt: new Date(now - MINUTE) }).where(eq(sessions.userId, old.id)).run();
    await sessionCookieFor(voided, undefined, now);
    getDb().update(users).set({ sessionVersion: voided.sessionVersion + 1 }).where(eq(users.id, voided.id)).run();

    expect(sweepSessions(now)).toBeGreaterThanOrEqual(3);
    expect(sessionRows(live.id)).toHaveLength(1);
    expect(sessionRows(idle.id)).toHaveLength(0);
    expect(sessionRows(old.id)).toHaveLength(0);
    expect(sessionRows(voided.id)).toHaveLength(0);
  });
});

describe("one's own sessions", () => {
  it("lists them with the browser in readable form, the address and this device", async () => {
    const user = makeUser("researcher");
    const phone = await signIn(user.email, SAFARI_PHONE);
    const laptop = await signIn(user.email, FIREFOX);
    const listed = await call(mySessionsRoute.GET, { path: "/api/v1/me/sessions", cookie: laptop });
    expect(listed.status).toBe(200);
    expect(listed.body.data).toHaveLength(2);
    expect(listed.body.data.map((s: { device: string; current: boolean; ip: string }) => [s.device, s.current, s.ip]).sort()).toEqual([
      ["Firefox 133 on Windows", true, "unknown"],
      ["Safari 18 on iPhone", false, "unknown"],
    ]);
    expect(listed.body.data[0]).toEqual({
      id: expect.any(Number),
      createdAt: expect.stringMatching(/^\d{4}-\d\d-\d\dT/),
      lastSeenAt: expect.stringMatching(/^\d{4}-\d\d-\d\dT/),
      userAgent: expect.any(String),
      device: expect.any(String),
      ip: "unknown",
      current: expect.any(Boolean),
    });
    expect((await me(phone)).status).toBe(200);
  });

  it("signs out everywhere else, keeping only the current session", async () => {
    const user = makeUser("facilities");
    const first = await signIn(user.email, SAFARI_PHONE);
    const second = await signIn(user.email, FIREFOX);
    const current = await signIn(user.email, FIREFOX);
    const other = makeUser("facilities");
    const othersCookie = await signIn(other.email);

    const ended = await call(mySessionsRoute.DELETE, { method: "DELETE", path: "/api/v1/me/sessions", cookie: current });
    expect(ended.status).toBe(200);
    expect(ended.body).toEqual({ ended: 2 });
    expect((await me(first)).status).toBe(401);
    expect((await me(second)).status).toBe(401);
    expect((await me(current)).status).toBe(200);
    expect((await me(othersCookie)).status).toBe(200);
    const listed = await call(mySessionsRoute.GET, { path: "/api/v1/me/sessions", cookie: current });
    expect(listed.body.data).toHaveLength(1);
    expect(listed.body.data[0].current).toBe(true);
    const audit = getDb().select().from(auditEvents).where(and(eq(auditEvents.action, "end_sessions"), eq(auditEvents.actorId, user.id))).all();
    expect(audit.map((a) => a.summary)).toEqual([`${user.email} signed out everywhere else (2 sessions)`]);
  });

  it("ends one own session by id; another person's session id answers 404 and keeps working", async () => {
    const user = makeUser("researcher");
    const phone = await signIn(user.email, SAFARI_PHONE);
    const laptop = await signIn(user.email, FIREFOX);
    const other = makeUser("researcher");
    const othersCookie = await signIn(other.email);
    const [phoneRow] = getDb().select().from(sessions).where(and(eq(sessions.userId, user.id), eq(sessions.userAgent, SAFARI_PHONE))).all();
    const [othersRow] = sessionRows(other.id);

    const ended = await call(mySessionRoute.DELETE, { method: "DELETE", cookie: laptop, params: { id: String(phoneRow.id) } });
    expect(ended.status).toBe(204);
    expect((await me(phone)).status).toBe(401);
    expect((await me(laptop)).status).toBe(200);

    const notMine = await call(mySessionRoute.DELETE, { method: "DELETE", cookie: laptop, params: { id: String(othersRow.id) } });
    expect(notMine.status).toBe(404);
    expect(notMine.body.error).toEqual({ code: "not_found", message: "That session was not found." });
    expect((await me(othersCookie)).status).toBe(200);
  });
});

describe("an administrator", () => {
  it("ends every session of a user; the user signs in again", async () => {
    const admin = makeUser("admin");
    const adminCookie = await signIn(admin.email);
    const user = makeUser("researcher");
    const phone = await signIn(user.email, SAFARI_PHONE);
    const laptop = await signIn(user.email, FIREFOX);

    const ended = await call(userSessionsRoute.DELETE, { method: "DELETE", cookie: adminCookie, params: { id: String(user.id) } });
    expect(ended.status).toBe(200);
    expect(ended.body).toEqual({ ended: 2 });
    expect((await me(phone)).status).toBe(401);
    expect((await me(laptop)).status).toBe(401);
    expect((await me(adminCookie)).status).toBe(200);
    expect(sessionRows(user.id)).toHaveLength(0);
    const audit = getDb().select().from(auditEvents).where(and(eq(auditEvents.action, "end_sessions"), eq(auditEvents.entityId, String(user.id)))).all();
    expect(audit.map((a) => [a.actorId, a.summary])).toEqual([[admin.id, `Signed ${user.email} out everywhere (2 sessions)`]]);

    expect((await me(await signIn(user.email))).status).toBe(200);
    const missing = await call(userSessionsRoute.DELETE, { method: "DELETE", cookie: adminCookie, params: { id: "999999" } });
    expect(missing.status).toBe(404);
  });

  it("is the only role that may", async () => {
    const officer = makeUser("safety_officer");
    const user = makeUser("researcher");
    const userCookie = await signIn(user.email);
    const refused = await call(userSessionsRoute.DELETE, { method: "DELETE", cookie: await signIn(officer.email), params: { id: String(user.id) } });
    expect(refused.status).toBe(403);
    expect((await me(userCookie)).status).toBe(200);
  });
});

describe("version-based invalidation", () => {
  it("deactivation and a role change end the user's sessions; reactivation does not bring them back", async () => {
    const admin = makeUser("admin");
    const user = makeUser("researcher");
    const before = await signIn(user.email);
    changeUserRole(actorOf(admin), user.id, "facilities");
    expect((await me(before)).status).toBe(401);

    const again = await signIn(user.email);
    expect((await me(again)).status).toBe(200);
    setUserActive(actorOf(admin), user.id, false);
    expect((await me(again)).status).toBe(401);
    setUserActive(actorOf(admin), user.id, true);
    expect((await me(again)).status).toBe(401);
    expect((await me(await signIn(user.email))).status).toBe(200);
  });

  it("a new password through a reset link ends every session and deletes their rows", async () => {
    const user = makeUser("researcher");
    const cookie = await signIn(user.email);
    const token = issueUserToken(getDb(), { userId: user.id, kind: "password_reset", ttlMs: HOUR });
    await setPasswordWithToken("password_reset", { token, password: "a brand new long password" });
    expect(sessionRows(user.id)).toHaveLength(0);
    expect((await me(cookie)).status).toBe(401);
  });

  it("a cookie recorded with an older version answers 401", async () => {
    const user = makeUser("auditor");
    const stale = await sessionCookieFor({ id: user.id, sessionVersion: user.sessionVersion - 1 });
    expect((await me(stale)).status).toBe(401);
    expect((await me(await sessionCookieFor(user))).status).toBe(200);
  });
});
