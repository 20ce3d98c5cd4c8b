/** Limits on abuse: sign-in per address and per account-and-address, resets, readings, expensive endpoints, client addresses. */
import { afterEach, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import bcrypt from "bcryptjs";
import { Piscina } from "piscina";
import { eq } from "drizzle-orm";
import { closeDb, getDb } from "@/db/client";
import { emailMessages, rateLimits, users } from "@/db/schema";
import * as sessionRoute from "@/app/api/v1/session/route";
import * as readingsRoute from "@/app/api/v1/readings/route";
import * as containerPreviewRoute from "@/app/api/v1/imports/containers/preview/route";
import * as usersRoute from "@/app/api/v1/users/route";
import { requestResetAction } from "@/app/(auth)/actions";
import { createApiKey } from "@/lib/api-keys/service";
import { MAX_WAITING_HASHES, verifyPassword } from "@/lib/auth/passwords";
import { clientIpFrom } from "@/lib/http/client-ip";
import { installPeerAddressHeader, PEER_ADDRESS_HEADER } from "@/lib/http/peer-address";
import { requestPasswordReset } from "@/lib/users/service";
import { call, makeUser, sessionCookieFor, TEST_PASSWORD } from "../helpers/world";

const GENERIC = "That e-mail address and password do not match an active account.";

/** A sign-in as `next start` delivers it: the socket's address stamped, and whatever X-Forwarded-For the client sent. */
function signIn(email: string, password: string, peer: string, forwardedFor?: string) {
  const headers: Record<string, string> = { [PEER_ADDRESS_HEADER]: peer };
  if (forwardedFor) headers["x-forwarded-for"] = forwardedFor;
  return call(sessionRoute.POST, { method: "POST", path: "/api/v1/session", body: { email, password }, headers });
}

const resetEmailsTo = (address: string) =>
  getDb().select().from(emailMessages).where(eq(emailMessages.kind, "password_reset")).all().filter((m) => m.toAddresses.includes(address)).length;

beforeAll(() => {
  installPeerAddressHeader();
});

beforeEach(() => {
  getDb().delete(rateLimits).run();
});

afterEach(() => {
  vi.restoreAllMocks();
  for (const name of ["TRUST_PROXY", "RATE_LIMIT_READINGS_KEY", "RATE_LIMIT_SIGN_IN_IP"]) delete process.env[name];
});

describe("sign-in limits", () => {
  it("an attacker's failures from one address do not lock the owner out from another", async () => {
    const owner = makeUser("admin");
    for (let i = 0; i < 10; i += 1) {
      const attempt = await signIn(owner.email, `guess ${i}`, "203.0.113.66");
      expect(attempt.status).toBe(401);
      expect(attempt.body.error.message).toBe(GENERIC);
    }
    const refused = await signIn(owner.email, TEST_PASSWORD, "203.0.113.66");
    expect(refused.status).toBe(429);
    expect(refused.body.error).toEqual({ code: "rate_limited", message: "Too many failed sign-in attempts. Try again in 15 minutes." });
    const retryAfter = Number(refused.headers.get("retry-after"));
    expect(retryAfter).toBeGreaterThan(890);
    expect(retryAfter).toBeLessThanOrEqual(900);

    const ownerFromOffice = await signIn(owner.email, TEST_PASSWORD, "198.51.100.20");
    expect(ownerFromOffice.status).toBe(200);
    expect(ownerFromOffice.body.user.id).toBe(owner.id);
  });

  it("refuses an address after 50 failures across accounts, without comparing the password", async () => {
    for (let i = 0; i < 50; i += 1) {
      expect((await signIn(`nobody.${i % 5}@example.test`, "x", "203.0.113.9")).status).toBe(401);
    }
    const someone = makeUser("researcher");
    // Passwords are compared in the password thread: count the comparisons sent to it.
    const run = vi.spyOn(Piscina.prototype, "run");
    const compare = { calls: () => run.mock.calls.filter(([task]) => (task as { op?: string }).op === "compare").length };
    const refused = await signIn(someone.email, TEST_PASSWORD, "203.0.113.9");
    expect(refused.status).toBe(429);
    expect(Number(refused.headers.get("retry-after"))).toBeGreaterThan(890);
    expect(compare.calls()).toBe(0);
    expect((await signIn(someone.email, TEST_PASSWORD, "203.0.113.10")).status).toBe(200);
    expect(compare.calls()).toBe(1);
  });

  it("does not count successful sign-ins, and a success clears the account's failures from that address", async () => {
    process.env.RATE_LIMIT_SIGN_IN_IP = "5";
    const user = makeUser("safety_officer");
    for (let i = 0; i < 12; i += 1) expect((await signIn(user.email, TEST_PASSWORD, "127.0.0.1")).status).toBe(200);
    delete process.env.RATE_LIMIT_SIGN_IN_IP;

    for (let i = 0; i < 9; i += 1) expect((await signIn(user.email, "wrong", "192.0.2.44")).status).toBe(401);
    expect((await signIn(user.email, TEST_PASSWORD, "192.0.2.44")).status).toBe(200);
    for (let i = 0; i < 9; i += 1) expect((await signIn(user.email, "wrong", "192.0.2.44")).status).toBe(401);
    expect((await signIn(user.email, TEST_PASSWORD, "192.0.2.44")).status).toBe(200);
    const counter = getDb().select().from(rateLimits).where(eq(rateLimits.key, "signInIp:192.0.2.44")).get();
    expect(counter?.points).toBe(18);
  });

  it("survives a restart: a new connection and new limiters read the same counts", async () => {
    const user = makeUser("auditor");
    for (let i = 0; i < 10; i += 1) await signIn(user.email, "wrong", "203.0.113.77");
    closeDb();
    const reopened = getDb();
    const stored = reopened.select().from(rateLimits).where(eq(rateLimits.key, `signInAccountIp:${user.email}|203.0.113.77`)).get();
    expect(stored?.points).toBe(10);
    expect(stored!.expire! - Date.now()).toBeGreaterThan(14 * 60_000);
    expect((await signIn(user.email, TEST_PASSWORD, "203.0.113.77")).status).toBe(429);
  });

  it("ignores X-Forwarded-For unless a proxy is trusted", async () => {
    const user = makeUser("researcher");
    for (let i = 0; i < 10; i += 1) {
      expect((await signIn(user.email, "wrong", "203.0.113.5", `10.9.8.${i}`)).status).toBe(401);
    }
    // The spoofed header changed nothing: all eleven came from one socket.
    expect((await signIn(user.email, TEST_PASSWORD, "203.0.113.5", "10.9.8.200")).status).toBe(429);

    process.env.TRUST_PROXY = "192.0.2.1";
    for (let i = 0; i < 10; i += 1) {
      expect((await signIn(user.email, "wrong", "192.0.2.1", `198.51.100.${i}`)).status).toBe(401);
    }
    // Behind the trusted proxy each client address counts apart.
    expect((await signIn(user.email, TEST_PASSWORD, "192.0.2.1", "198.51.100.200")).status).toBe(200);
  });
});

describe("password hashing", () => {
  it("runs one hash at a time and refuses more than 64 waiting with 429, rather than stall the server", async () => {
    const hash = bcrypt.hashSync(TEST_PASSWORD, 4);
    const outcomes = await Promise.all(
      Array.from({ length: MAX_WAITING_HASHES + 6 }, (_, i) =>
        verifyPassword(i === 0 ? TEST_PASSWORD : "wrong", hash).then(
          (matches) => (matches ? "match" : "no match"),
          (error: { status: number; retryAfterSeconds: number }) => `${error.status} after ${error.retryAfterSeconds} s`,
        ),
      ),
    );
    expect(outcomes.filter((o) => o === "match")).toHaveLength(1);
    expect(outcomes.filter((o) => o === "no match")).toHaveLength(MAX_WAITING_HASHES);
    expect(outcomes.filter((o) => o === "429 after 10 s")).toHaveLength(5);
    expect(await verifyPassword(TEST_PASSWORD, hash)).toBe(true);
  });

  it("compares in a thread of its own: sixteen sign-ins at cost 11 leave this thread free", async () => {
    const hash = bcrypt.hashSync(TEST_PASSWORD, 11);
    let longestGapMs = 0;
    let last = performance.now();
    const ticker = setInterval(() => {
      const now = performance.now();
      longestGapMs = Math.max(longestGapMs, now - last);
      last = now;
    }, 5);
    const startedAt = performance.now();
    try {
      const outcomes = await Promise.all(Array.from({ length: 16 }, () => verifyPassword("wrong", hash)));
      expect(outcomes.every((matches) => matches === false)).toBe(true);
    } finally {
      clearInterval(ticker);
    }
    // Sixteen compares at cost 11 take seconds of CPU; this thread's timer never waited more than a
    // fraction of one of them (generous for a loaded test machine).
    expect(performance.now() - startedAt).toBeGreaterThan(500);
    expect(longestGapMs).toBeLessThan(100);
  }, 60_000);
});

describe("the client's address", () => {
  const headers = (peer: string | null, forwarded?: string) => {
    const h = new Headers();
    if (peer) h.set(PEER_ADDRESS_HEADER, peer);
    if (forwarded) h.set("x-forwarded-for", forwarded);
    return h;
  };

  it("is the socket's address when no proxy is trusted, whatever X-Forwarded-For says", () => {
    expect(clientIpFrom(headers("203.0.113.5", "1.2.3.4"), { kind: "off" })).toBe("203.0.113.5");
    expect(clientIpFrom(headers("::ffff:203.0.113.5"), { kind: "off" })).toBe("203.0.113.5");
    expect(clientIpFrom(headers("2001:db8::1"), { kind: "off" })).toBe("2001:db8::1");
  });

  it("follows X-Forwarded-For by the number of trusted hops, counted from the socket", () => {
    const h = headers("10.0.0.2", "1.2.3.4, 198.51.100.7, 10.0.0.1");
    expect(clientIpFrom(h, { kind: "hops", hops: 1 })).toBe("10.0.0.1");
    expect(clientIpFrom(h, { kind: "hops", hops: 2 })).toBe("198.51.100.7");
    expect(clientIpFrom(h, { kind: "hops", hops: 9 })).toBe("1.2.3.4");
  });

  it("skips only the listed proxies, so a client that bypasses them is taken at its socket", () => {
    const trust = { kind: "addresses" as const, addresses: ["10.0.0.1", "10.0.0.2"] };
    expect(clientIpFrom(headers("10.0.0.2", "1.2.3.4, 198.51.100.7, 10.0.0.1"), trust)).toBe("198.51.100.7");
    expect(clientIpFrom(headers("203.0.113.5", "198.51.100.7"), trust)).toBe("203.0.113.5");
  });

  it("takes Next's own X-Forwarded-For entry when the socket was not stamped, and 'unknown' without either", () => {
    expect(clientIpFrom(headers(null, "203.0.113.8"), { kind: "off" })).toBe("203.0.113.8");
    expect(clientIpFrom(headers(null), { kind: "off" })).toBe("unknown");
  });
});

describe("password reset e-mails", () => {
  it("queues at most 3 an hour per address; the 4th gets the same neutral answer and no e-mail", async () => {
    const user = makeUser("researcher");
    const form = new FormData();
    form.set("email", user.email);
    const answers: (string | undefined)[] = [];
    for (let i = 0; i < 4; i += 1) {
      answers.push((await requestResetAction(undefined, form)).message);
      await vi.waitFor(() => expect(getDb().select().from(rateLimits).where(eq(rateLimits.key, `resetAddress:${user.email}`)).get()?.points).toBe(i + 1));
    }
    await new Promise((resolve) => setTimeout(resolve, 20));
    expect(resetEmailsTo(user.email)).toBe(3);
    expect(new Set(answers)).toEqual(
      new Set(["If an account exists for that address, a link to reset its password is on its way. It expires in 60 minutes."]),
    );
  });

  it("counts addresses without an account too, and 20 an hour per client address", async () => {
    const people = Array.from({ length: 21 }, () => makeUser("auditor"));
    for (const [i, person] of people.entries()) {
      expect(await requestPasswordReset(person.email, { clientIp: "203.0.113.200" })).toBe(i < 20);
    }
    expect(resetEmailsTo(people[20].email)).toBe(0);
    expect(await requestPasswordReset(people[20].email, { clientIp: "198.51.100.3" })).toBe(true);

    for (let i = 0; i < 3; i += 1) expect(await requestPasswordReset("ghost@example.test", { clientIp: `192.0.2.${i}` })).toBe(false);
    const stored = getDb().select().from(rateLimits).where(eq(rateLimits.key, "resetAddress:ghost@example.test")).get();
    expect(stored?.points).toBe(3);
  });
});

describe("invitations", () => {
  it("answers 429 on the 4th invitation to one address within the hour", async () => {
    const admin = makeUser("admin");
    const cookie = await sessionCookieFor(admin);
    const body = { email: "often.invited@example.test", name: "Often Invited", role: "researcher" };
    for (let i = 0; i < 3; i += 1) expect((await call(usersRoute.POST, { method: "POST", body, cookie })).status).toBe(201);
    const refused = await call(usersRoute.POST, { method: "POST", body, cookie });
    expect(refused.status).toBe(429);
    expect(refused.body.error.message).toMatch(/^Too many invitations to this address\. Try again in (59|60) minutes\.$/);
    expect(Number(refused.headers.get("retry-after"))).toBeGreaterThan(3500);
    const invitations = getDb().select().from(emailMessages).where(eq(emailMessages.kind, "invitation")).all().filter((m) => m.toAddresses.includes(body.email));
    expect(invitations).toHaveLength(3);
  });
});

describe("readings per API key", () => {
  it("answers 429 with Retry-After past the key's batches per minute; another key goes on", async () => {
    process.env.RATE_LIMIT_READINGS_KEY = "3";
    const admin = getDb().select().from(users).where(eq(users.role, "admin")).get()!;
    const actor = { id: admin.id, email: admin.email, name: admin.name, role: admin.role };
    const first = createApiKey(actor, { name: "Logger gateway A", scopes: ["readings:write"] }).key;
    const second = createApiKey(actor, { name: "Logger gateway B", scopes: ["readings:write"] }).key;
    const post = async (key: string) => {
      const response = await readingsRoute.POST(
        new Request("http://localhost/api/v1/readings", {
          method: "POST",
          headers: { authorization: `Bearer ${key}`, "content-type": "application/json" },
          body: JSON.stringify({ readings: [{ sensor: "NO-SUCH-LOGGER", at: "2026-07-14T15:40:00Z", tempC: 5 }] }),
        }),
      );
      return { status: response.status, retryAfter: response.headers.get("retry-after"), body: await response.json() };
    };
    for (let i = 0; i < 3; i += 1) expect((await post(first)).status).toBe(400);
    const refused = await post(first);
    expect(refused.status).toBe(429);
    expect(refused.body.error.message).toBe("This API key sent too many batches of readings. Try again in 1 minute.");
    expect(Number(refused.retryAfter)).toBeGreaterThan(50);
    expect(Number(refused.retryAfter)).toBeLessThanOrEqual(60);
    expect((await post(second)).status).toBe(400);
  });
});

describe("expensive endpoints per user", () => {
  it("the 21st import preview within a minute answers 429; another user goes on", async () => {
    const officer = makeUser("safety_officer");
    const cookie = await sessionCookieFor(officer);
    for (let i = 0; i < 20; i += 1) {
      expect((await call(containerPreviewRoute.POST, { method: "POST", path: "/api/v1/imports/containers/preview", cookie })).status).toBe(400);
    }
    const refused = await call(containerPreviewRoute.POST, { method: "POST", path: "/api/v1/imports/containers/preview", cookie });
    expect(refused.status).toBe(429);
    expect(refused.body.error).toEqual({ code: "rate_limited", message: "Too many imports and previews. Try again in 1 minute." });
    expect(Number(refused.headers.get("retry-after"))).toBeLessThanOrEqual(60);
    const colleague = await sessionCookieFor(makeUser("safety_officer"));
    expect((await call(containerPreviewRoute.POST, { method: "POST", path: "/api/v1/imports/containers/preview", cookie: colleague })).status).toBe(400);
  });
});
