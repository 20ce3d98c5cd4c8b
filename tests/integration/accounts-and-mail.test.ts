import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { emailMessages, userTokens, users } from "@/db/schema";
import { signInWithPassword } from "@/lib/auth/sign-in";
import { backoffMs, deliverDueMessages } from "@/lib/mail/deliver";
import { startEmailFake, type EmailFake } from "@/lib/mail/fake-server";
import {
  changeUserRole,
  findInvitation,
  inviteUser,
  requestPasswordReset,
  setPasswordWithToken,
  setUserActive,
} from "@/lib/users/service";
import { makeUser, TEST_PASSWORD } from "./helpers/world";

let fake: EmailFake;

beforeAll(async () => {
  fake = await startEmailFake({ port: 0 });
  process.env.RESEND_BASE_URL = fake.url;
});

afterAll(async () => {
  await fake.close();
});

function actorOf(user: ReturnType<typeof makeUser>) {
  return { id: user.id, email: user.email, name: user.name, role: user.role };
}

/** Delivers the outbox to the fake and returns the token from the newest link sent to `to`. */
async function linkTokenSentTo(to: string, pathPrefix: string): Promise<string> {
  await deliverDueMessages();
  const message = fake.messages.find((m) => m.to.includes(to));
  expect(message, `a message to ${to}`).toBeDefined();
  const match = message!.text!.match(new RegExp(`${pathPrefix}/([A-Za-z0-9_-]+)`));
  expect(match).not.toBeNull();
  return match![1];
}

describe("invitations", () => {
  it("creates the account, e-mails a single-use link, and activates on a new password", async () => {
    const admin = makeUser("admin");
    const invited = await inviteUser(actorOf(admin), { email: "  New.Chemist@Example.test ", name: "New Chemist", role: "researcher" });
    expect(invited.email).toBe("new.chemist@example.test");
    expect(invited.passwordHash).toBeNull();
    const token = await linkTokenSentTo("new.chemist@example.test", "/invitation");
    expect(fake.messages[0].subject).toBe("You are invited to Headroom");
    expect(fake.messages[0].html).toContain("http://localhost:3999/invitation/");
    expect(findInvitation(token)).toEqual({ email: "new.chemist@example.test", name: "New Chemist" });

    await setPasswordWithToken("invitation", { token, password: "a long new password", name: "Nova Chemist" });
    const signedIn = await signInWithPassword("new.chemist@example.test", "a long new password");
    expect(signedIn.name).toBe("Nova Chemist");
    await expect(setPasswordWithToken("invitation", { token, password: "another long password" })).rejects.toThrow(/expired or was already used/);
  });

  it("only stores a hash of the token", async () => {
    const admin = makeUser("admin");
    await inviteUser(actorOf(admin), { email: "hashed@example.test", name: "Hashed", role: "auditor" });
    const token = await linkTokenSentTo("hashed@example.test", "/invitation");
    const rows = getDb().select().from(userTokens).all();
    expect(rows.some((row) => row.tokenHash === token)).toBe(false);
  });

  it("refuses an expired invitation", async () => {
    const admin = makeUser("admin");
    const invited = await inviteUser(actorOf(admin), { email: "late@example.test", name: "Late", role: "facilities" });
    const token = await linkTokenSentTo("late@example.test", "/invitation");
    getDb().update(userTokens).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(userTokens.userId, invited.id)).run();
    expect(findInvitation(token)).toBeNull();
    await expect(setPasswordWithToken("invitation", { token, password: "a long new password" })).rejects.toThrow(/expired/);
  });

  it("refuses to invite someone who already has an account", async () => {
    const admin = makeUser("admin");
    const existing = makeUser("researcher");
    await expect(inviteUser(actorOf(admin), { email: existing.email, name: "x", role: "researcher" })).rejects.toThrow(/already has an account/);
  });
});

describe("password reset", () => {
  it("sends a link only for a real account, resets once, and voids older sessions", async () => {
    const user = makeUser("facilities");
    const before = fake.messages.length;
    await requestPasswordReset("no-account@example.test");
    await deliverDueMessages();
    expect(fake.messages.length).toBe(before);

    await requestPasswordReset(user.email);
    const token = await linkTokenSentTo(user.email, "/reset-password");
    const updated = await setPasswordWithToken("password_reset", { token, password: "the brand new password" });
    expect(updated.sessionVersion).toBe(user.sessionVersion + 1);
    await expect(signInWithPassword(user.email, TEST_PASSWORD)).rejects.toThrow();
    expect((await signInWithPassword(user.email, "the brand new password")).id).toBe(user.id);
    await expect(setPasswordWithToken("password_reset", { token, password: "yet another password" })).rejects.toThrow(/already used/);
  });

  it("a newer reset link replaces the older one", async () => {
    const user = makeUser("auditor");
    await requestPasswordReset(user.email);
    const first = await linkTokenSentTo(user.email, "/reset-password");
    await requestPasswordReset(user.email);
    const second = await linkTokenSentTo(user.email, "/reset-password");
    expect(second).not.toBe(first);
    await expect(setPasswordWithToken("password_reset", { token: first, password: "a long new password" })).rejects.toThrow();
    await setPasswordWithToken("password_reset", { token: second, password: "a long new password" });
  });
});

describe("roles and deactivation", () => {
  it("changes a role and deactivates, voiding the user's sessions each time", () => {
    const admin = makeUser("admin");
    const user = makeUser("researcher");
    const promoted = changeUserRole(actorOf(admin), user.id, "safety_officer");
    expect(promoted.role).toBe("safety_officer");
    expect(promoted.sessionVersion).toBe(user.sessionVersion + 1);
    const deactivated = setUserActive(actorOf(admin), user.id, false);
    expect(deactivated.active).toBe(false);
    expect(deactivated.sessionVersion).toBe(user.sessionVersion + 2);
  });

  it("refuses to change one's own role or to remove the last active administrator", () => {
    getDb().update(users).set({ active: false }).where(eq(users.role, "admin")).run();
    const onlyAdmin = makeUser("admin");
    expect(() => changeUserRole(actorOf(onlyAdmin), onlyAdmin.id, "auditor")).toThrow(/own role/);
    const other = makeUser("safety_officer");
    expect(() => changeUserRole(actorOf(other), onlyAdmin.id, "auditor")).toThrow(/last active administrator/);
    expect(() => setUserActive(actorOf(other), onlyAdmin.id, false)).toThrow(/last active administrator/);
  });
});

describe("the outbox", () => {
  it("keeps a message queued with its error while the service is down, and delivers it on retry", async () => {
    const admin = makeUser("admin");
    await fetch(`${fake.url}/fake/outage`, { method: "POST", body: JSON.stringify({ down: true }) });
    await inviteUser(actorOf(admin), { email: "during.outage@example.test", name: "During Outage", role: "auditor" });
    const failed = await deliverDueMessages();
    expect(failed).toEqual({ sent: 0, failed: 1 });
    const queued = getDb().select().from(emailMessages).all().find((m) => m.toAddresses.includes("during.outage@example.test"))!;
    expect(queued.status).toBe("queued");
    expect(queued.attempts).toBe(1);
    expect(queued.lastError).toMatch(/simulated outage/);
    expect(queued.nextAttemptAt.getTime()).toBeGreaterThan(Date.now());

    await fetch(`${fake.url}/fake/outage`, { method: "POST", body: JSON.stringify({ down: false }) });
    expect(await deliverDueMessages()).toEqual({ sent: 0, failed: 0 }); // not due yet: backoff holds
    const retried = await deliverDueMessages(getDb(), Date.now() + backoffMs(1) + 1);
    expect(retried.sent).toBe(1);
    const sent = getDb().select().from(emailMessages).where(eq(emailMessages.id, queued.id)).get()!;
    expect(sent.status).toBe("sent");
    expect(sent.attempts).toBe(2);
    expect(fake.messages.filter((m) => m.to.includes("during.outage@example.test"))).toHaveLength(1);
  });

  it("keeps a message queued when the service cannot be reached at all", async () => {
    const admin = makeUser("admin");
    const saved = process.env.RESEND_BASE_URL;
    process.env.RESEND_BASE_URL = "http://127.0.0.1:9";
    await inviteUser(actorOf(admin), { email: "unreachable@example.test", name: "Unreachable", role: "auditor" });
    const run = await deliverDueMessages();
    process.env.RESEND_BASE_URL = saved;
    expect(run.failed).toBeGreaterThanOrEqual(1);
    const row = getDb().select().from(emailMessages).all().find((m) => m.toAddresses.includes("unreachable@example.test"))!;
    expect(row.status).toBe("queued");
    expect(row.lastError).toBeTruthy();
  });

  it("backs off exponentially, capped at an hour", () => {
    expect([1, 2, 3, 4].map(backoffMs)).toEqual([5_000, 10_000, 20_000, 40_000]);
    expect(backoffMs(30)).toBe(3_600_000);
  });
});
