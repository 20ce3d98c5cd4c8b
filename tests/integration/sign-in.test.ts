import { beforeEach, describe, expect, it, vi } from "vitest";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { auditEvents, rateLimits } from "@/db/schema";
import { signInWithPassword } from "@/lib/auth/sign-in";
import * as sessionRoute from "@/app/api/v1/session/route";
import * as meRoute from "@/app/api/v1/me/route";
import { call, makeUser, TEST_PASSWORD } from "./helpers/world";

const GENERIC = "That e-mail address and password do not match an active account.";

function signIn(email: string, password: string) {
  return call(sessionRoute.POST, { method: "POST", path: "/api/v1/session", body: { email, password } });
}

describe("POST /api/v1/session", () => {
  beforeEach(() => {
    getDb().delete(rateLimits).run();
  });

  it("signs in with the right password, sets an httpOnly SameSite=Lax cookie, and /me answers", async () => {
    const user = makeUser("safety_officer");
    const response = await signIn(user.email.toUpperCase(), TEST_PASSWORD);
    expect(response.status).toBe(200);
    expect(response.body).toEqual({ user: { id: user.id, email: user.email, name: user.name, role: "safety_officer" } });
    const setCookie = response.headers.get("set-cookie") ?? "";
    expect(setCookie).toMatch(/^headroom_session=/);
    expect(setCookie).toMatch(/HttpOnly/i);
    expect(setCookie).toMatch(/SameSite=Lax/i);
    const me = await call(meRoute.GET, { cookie: setCookie.split(";")[0] });
    expect(me.status).toBe(200);
    expect(me.body.user.email).toBe(user.email);
    const audit = getDb().select().from(auditEvents).where(eq(auditEvents.action, "sign_in")).all();
    expect(audit.some((a) => a.actorId === user.id)).toBe(true);
  });

  it("answers a wrong password with 401 and the generic message", async () => {
    const user = makeUser("researcher");
    const response = await signIn(user.email, "not the password");
    expect(response.status).toBe(401);
    expect(response.body).toEqual({ error: { code: "invalid_credentials", message: GENERIC } });
    expect(response.headers.get("set-cookie")).toBeNull();
  });

  it("answers an unknown e-mail address exactly like a wrong password", async () => {
    const response = await signIn("nobody@example.test", TEST_PASSWORD);
    expect(response.status).toBe(401);
    expect(response.body).toEqual({ error: { code: "invalid_credentials", message: GENERIC } });
  });

  it("refuses a deactivated user with the same generic answer, even with the right password", async () => {
    const user = makeUser("facilities", { active: false });
    const response = await signIn(user.email, TEST_PASSWORD);
    expect(response.status).toBe(401);
    expect(response.body.error.message).toBe(GENERIC);
  });

  it("refuses an invited user who has not set a password yet", async () => {
    const user = makeUser("auditor", { passwordHash: null });
    const response = await signIn(user.email, "");
    expect(response.status).toBe(401);
  });

  it("answers 400 with field errors when the body is not a sign-in", async () => {
    const response = await signIn("not-an-address", TEST_PASSWORD);
    expect(response.status).toBe(400);
    expect(response.body.error.code).toBe("invalid_input");
    expect(response.body.error.fields.email[0]).toMatch(/valid e-mail/);
    const notJson = await call(sessionRoute.POST, { method: "POST", body: "{oops" });
    expect(notJson.status).toBe(400);
  });

  it("refuses the account from that address after 10 failures: 429 with Retry-After, even for the right password", async () => {
    const user = makeUser("admin");
    for (let i = 0; i < 10; i += 1) {
      expect((await signIn(user.email, `wrong ${i}`)).status).toBe(401);
    }
    const refused = await signIn(user.email, TEST_PASSWORD);
    expect(refused.status).toBe(429);
    expect(refused.body.error.code).toBe("rate_limited");
    expect(refused.body.error.message).toMatch(/^Too many failed sign-in attempts\. Try again in 15 minutes\.$/);
    expect(Number(refused.headers.get("retry-after"))).toBeGreaterThan(800);
    expect(Number(refused.headers.get("retry-after"))).toBeLessThanOrEqual(900);
  });

  it("refuses unknown addresses the same way, so the limit reveals nothing", async () => {
    for (let i = 0; i < 10; i += 1) await signIn("ghost@example.test", "x");
    expect((await signIn("ghost@example.test", "x")).status).toBe(429);
  });

  it("lets the account in again once the 15-minute window has passed", async () => {
    vi.useFakeTimers({ toFake: ["Date"] });
    try {
      const user = makeUser("researcher");
      for (let i = 0; i < 10; i += 1) {
        await expect(signInWithPassword(user.email, "wrong", { clientIp: "192.0.2.7" })).rejects.toThrow(GENERIC);
      }
      await expect(signInWithPassword(user.email, TEST_PASSWORD, { clientIp: "192.0.2.7" })).rejects.toMatchObject({ status: 429 });
      vi.setSystemTime(Date.now() + 15 * 60_000 + 1000);
      const later = await signInWithPassword(user.email, TEST_PASSWORD, { clientIp: "192.0.2.7" });
      expect(later.id).toBe(user.id);
    } finally {
      vi.useRealTimers();
    }
  });
});

describe("DELETE /api/v1/session", () => {
  it("clears the cookie", async () => {
    const response = await call(sessionRoute.DELETE, { method: "DELETE" });
    expect(response.status).toBe(204);
    expect(response.headers.get("set-cookie")).toMatch(/headroom_session=;/);
  });
});
