/**
 * Single sign-on end to end against the local provider (oidc-provider) on a port of its own: the
 * start route, the provider's login form driven with fetch, the callback route, the accounts.
 */
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { and, desc, eq } from "drizzle-orm";
import { unsealData } from "iron-session";
import { getDb } from "@/db/client";
import { auditEvents, emailMessages, rateLimits, settings, sessions, userTokens, users } from "@/db/schema";
import { SESSION_COOKIE } from "@/lib/auth/session";
import { signInWithPassword } from "@/lib/auth/sign-in";
import { forgetOidcConfiguration } from "@/lib/sso/client";
import { startOidcFake, type FakePerson, type OidcFake } from "@/lib/sso/fake-provider";
import { SSO_ACCOUNT_MESSAGE, SSO_REQUIRED_MESSAGE } from "@/lib/sso/errors";
import { saveSsoSettings, SSO_SETTINGS_KEY } from "@/lib/sso/settings";
import type { SsoCookieData } from "@/lib/sso/state-cookie";
import * as startRoute from "@/app/(auth)/sso/route";
import * as callbackRoute from "@/app/(auth)/sso/callback/route";
import { changeUserRole, inviteUser, requestPasswordReset, setUserActive } from "@/lib/users/service";
import { makeUser, TEST_PASSWORD } from "./helpers/world";

const PORT = 4151;
const APP = "http://localhost:3999";
const PASSWORD = "provider-password";

const person = (login: string, email: string, groups: string[], emailVerified = true): FakePerson => ({
  login,
  password: PASSWORD,
  name: `Person ${login}`,
  email,
  emailVerified,
  groups,
});

const PEOPLE = [
  person("ava", "ava.invited@example.test", ["lab-staff", "safety-office"]),
  person("ben", "ben.stranger@example.test", ["lab-staff"]),
  person("cleo", "cleo@open.example.test", ["lab-staff"]),
  person("dev", "dev.nogroup@example.test", []),
  person("eli", "eli.active@example.test", ["lab-staff"]),
  person("fay", "fay.off@example.test", ["lab-staff"]),
  person("gus", "gus.unverified@example.test", ["lab-staff"], false),
  person("hal", "hal.admin@example.test", ["lab-staff"]),
];

let fake: OidcFake;
const ctx = { params: Promise.resolve({}) };

function cookiesFrom(response: Response): string[] {
  return response.headers.getSetCookie().map((c) => c.split(";")[0]);
}

/** A small cookie jar for the provider's own cookies. */
class Jar {
  private readonly values = new Map<string, string>();
  take(response: Response) {
    for (const pair of cookiesFrom(response)) {
      const [name, ...rest] = pair.split("=");
      const value = rest.join("=");
      if (value) this.values.set(name, value);
      else this.values.delete(name);
    }
  }
  header(): string {
    return [...this.values].map(([k, v]) => `${k}=${v}`).join("; ");
  }
}

async function startSignIn(): Promise<{ authUrl: URL; ssoCookie: string }> {
  const response = await startRoute.GET(new Request(`${APP}/sso`), ctx);
  expect(response.status).toBe(303);
  const ssoCookie = cookiesFrom(response).find((c) => c.startsWith("headroom_sso="));
  expect(ssoCookie).toBeDefined();
  return { authUrl: new URL(response.headers.get("location")!), ssoCookie: ssoCookie! };
}

/** Follows the provider's redirects, fills its login form, and returns where it sends the browser back to. */
async function loginAtProvider(authUrl: URL, login: string, password = PASSWORD): Promise<URL> {
  const jar = new Jar();
  let response = await fetch(authUrl, { redirect: "manual" });
  jar.take(response);
  const interactionUrl = new URL(response.headers.get("location")!, fake.issuer);
  expect(interactionUrl.pathname).toMatch(/^\/interaction\//);
  response = await fetch(interactionUrl, { headers: { cookie: jar.header() }, redirect: "manual" });
  const form = await response.text();
  expect(form).toContain('name="login"');
  expect(form).toContain(">Continue</button>");
  response = await fetch(new URL(`${interactionUrl.pathname}/login`, fake.issuer), {
    method: "POST",
    headers: { cookie: jar.header(), "content-type": "application/x-www-form-urlencoded" },
    body: new URLSearchParams({ login, password }).toString(),
    redirect: "manual",
  });
  jar.take(response);
  let location = new URL(response.headers.get("location")!, fake.issuer);
  for (let hops = 0; location.origin === fake.issuer && hops < 5; hops += 1) {
    response = await fetch(location, { headers: { cookie: jar.header() }, redirect: "manual" });
    jar.take(response);
    location = new URL(response.headers.get("location")!, fake.issuer);
  }
  expect(location.origin + location.pathname).toBe(`${APP}/sso/callback`);
  return location;
}

async function callback(url: URL, ssoCookie: string) {
  const response = await callbackRoute.GET(new Request(url, { headers: { cookie: ssoCookie } }), ctx);
  const set = cookiesFrom(response);
  const ssoSealed = set.find((c) => c.startsWith("headroom_sso="))?.slice("headroom_sso=".length);
  const refusal = ssoSealed ? (await unsealData<SsoCookieData>(decodeURIComponent(ssoSealed), { password: process.env.SESSION_SECRET! })).refusal : undefined;
  return { status: response.status, location: response.headers.get("location"), session: set.find((c) => c.startsWith(`${SESSION_COOKIE}=`) && c.length > SESSION_COOKIE.length + 1), refusal };
}

async function signInAs(login: string) {
  const { authUrl, ssoCookie } = await startSignIn();
  return callback(await loginAtProvider(authUrl, login), ssoCookie);
}

const admin = () => getDb().select().from(users).where(eq(users.email, "sso.admin@example.test")).get()!;

function setSettings(value: Partial<{ mappings: { group: string; role: "admin" | "safety_officer" | "researcher" | "facilities" | "auditor" }[]; jitDomains: string[]; requireSso: boolean; breakGlassUserId: number }>) {
  saveSsoSettings({ id: admin().id, email: admin().email, name: "Admin", role: "admin", sessionVersion: 1 } as never, {
    mappings: value.mappings ?? [
      { group: "safety-office", role: "safety_officer" },
      { group: "lab-staff", role: "researcher" },
    ],
    jitDomains: value.jitDomains ?? [],
    requireSso: value.requireSso ?? false,
    breakGlassUserId: value.breakGlassUserId,
  });
}

beforeAll(async () => {
  fake = await startOidcFake({ port: PORT, redirectUris: [`${APP}/sso/callback`], people: PEOPLE });
  process.env.OIDC_ISSUER = fake.issuer;
  process.env.OIDC_CLIENT_ID = fake.clientId;
  process.env.OIDC_CLIENT_SECRET = fake.clientSecret;
  forgetOidcConfiguration();
  makeUser("admin", { email: "sso.admin@example.test" });
});

afterAll(async () => {
  delete process.env.OIDC_ISSUER;
  delete process.env.OIDC_CLIENT_ID;
  delete process.env.OIDC_CLIENT_SECRET;
  forgetOidcConfiguration();
  await fake.close();
});

beforeEach(() => {
  getDb().delete(rateLimits).run();
  getDb().delete(settings).where(eq(settings.key, SSO_SETTINGS_KEY)).run();
  setSettings({});
});

describe("single sign-on", () => {
  it("sends the person to the provider with PKCE S256, state, nonce, the scopes and the redirect URI from APP_URL", async () => {
    const { authUrl, ssoCookie } = await startSignIn();
    expect(authUrl.origin).toBe(`http://localhost:${PORT}`);
    const q = authUrl.searchParams;
    expect(q.get("response_type")).toBe("code");
    expect(q.get("client_id")).toBe(fake.clientId);
    expect(q.get("redirect_uri")).toBe(`${APP}/sso/callback`);
    expect(q.get("scope")).toBe("openid email profile groups");
    expect(q.get("code_challenge_method")).toBe("S256");
    expect(q.get("code_challenge")).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(q.get("state")!.length).toBeGreaterThanOrEqual(32);
    expect(q.get("nonce")!.length).toBeGreaterThanOrEqual(32);
    // The verifier, state and nonce live only in the sealed cookie.
    const sealed = decodeURIComponent(ssoCookie.slice("headroom_sso=".length));
    const data = await unsealData<SsoCookieData>(sealed, { password: process.env.SESSION_SECRET! });
    expect(data.pending?.state).toBe(q.get("state"));
    expect(data.pending?.nonce).toBe(q.get("nonce"));
    expect(sealed).not.toContain(q.get("state")!);
  });

  it("counts each start against the sign-in limit for the address and sends the person back to the sign-in page beyond it", async () => {
    process.env.RATE_LIMIT_SIGN_IN_IP = "2";
    try {
      await startSignIn();
      await startSignIn();
      const refused = await startRoute.GET(new Request(`${APP}/sso`), ctx);
      expect(refused.status).toBe(303);
      expect(refused.headers.get("location")).toBe(`${APP}/sign-in?sso=limited`);
      expect(refused.headers.getSetCookie()).toHaveLength(0);
    } finally {
      delete process.env.RATE_LIMIT_SIGN_IN_IP;
    }
  });

  it("refuses a tampered or missing state with the refusal page, and signs nobody in", async () => {
    makeUser("researcher", { email: "ava.invited@example.test", passwordHash: null });
    const { authUrl, ssoCookie } = await startSignIn();
    const back = await loginAtProvider(authUrl, "ava");
    const tampered = new URL(back);
    tampered.searchParams.set("state", "not-the-state-we-sent");
    const refused = await callback(tampered, ssoCookie);
    expect(refused.status).toBe(303);
    expect(refused.location).toBe(`${APP}/sso/refused`);
    expect(refused.session).toBeUndefined();
    expect(refused.refusal?.reason).toBe("state");
    const noCookie = await callback(back, "");
    expect(noCookie.refusal?.reason).toBe("state");
    expect(noCookie.session).toBeUndefined();
    const ava = getDb().select().from(users).where(eq(users.email, "ava.invited@example.test")).get()!;
    expect(ava.ssoSubject).toBeNull();
  });

  it("links an invited person at the first sign-in, gives the first matching group's role, and audits the method", async () => {
    const ava = getDb().select().from(users).where(eq(users.email, "ava.invited@example.test")).get()!;
    expect(ava.role).toBe("researcher");
    const result = await signInAs("ava");
    expect(result.location).toBe(`${APP}/`);
    expect(result.session).toBeDefined();
    const after = getDb().select().from(users).where(eq(users.id, ava.id)).get()!;
    // ava has lab-staff and safety-office; the safety-office rule comes first.
    expect(after.role).toBe("safety_officer");
    expect(after.ssoIssuer).toBe(`http://localhost:${PORT}`);
    expect(after.ssoSubject).toBe("ava");
    expect(after.signInMethod).toBe("sso");
    expect(after.passwordHash).toBeNull();
    const events = getDb().select().from(auditEvents).where(eq(auditEvents.entityId, String(ava.id))).orderBy(desc(auditEvents.id)).all();
    const signIn = events.find((e) => e.action === "sign_in")!;
    expect(signIn.after).toMatchObject({ method: "sso", role: "safety_officer", groups: ["lab-staff", "safety-office"] });
    expect(signIn.summary).toBe("ava.invited@example.test signed in with single sign-on");
    expect(events.find((e) => e.action === "change_role")?.after).toEqual({ role: "safety_officer" });
    expect(events.some((e) => e.action === "link_sso")).toBe(true);

    // The next sign-in finds the account by its identity; the role follows the groups again.
    fake.setGroups("ava", ["lab-staff"]);
    const again = await signInAs("ava");
    expect(again.session).toBeDefined();
    expect(getDb().select().from(users).where(eq(users.id, ava.id)).get()!.role).toBe("researcher");
  });

  it("refuses a person who was not invited, unless their domain is open to accounts made at the first sign-in", async () => {
    const ben = await signInAs("ben");
    expect(ben.session).toBeUndefined();
    expect(ben.refusal).toEqual({ reason: "not_invited", groups: ["lab-staff"], email: "ben.stranger@example.test" });
    expect(getDb().select().from(users).where(eq(users.email, "ben.stranger@example.test")).get()).toBeUndefined();

    setSettings({ jitDomains: ["open.example.test"] });
    const cleo = await signInAs("cleo");
    expect(cleo.session).toBeDefined();
    const made = getDb().select().from(users).where(eq(users.email, "cleo@open.example.test")).get()!;
    expect(made).toMatchObject({ role: "researcher", signInMethod: "sso", ssoSubject: "cleo", passwordHash: null, name: "Person cleo" });
    // A subdomain or another domain is still closed.
    expect((await signInAs("ben")).refusal?.reason).toBe("not_invited");
  });

  it("refuses a person whose groups match no rule, creating no session, and audits the refusal with the groups", async () => {
    makeUser("auditor", { email: "dev.nogroup@example.test", passwordHash: null });
    const result = await signInAs("dev");
    expect(result.session).toBeUndefined();
    expect(result.refusal).toEqual({ reason: "no_group", groups: [], email: "dev.nogroup@example.test" });
    const dev = getDb().select().from(users).where(eq(users.email, "dev.nogroup@example.test")).get()!;
    expect(dev.ssoSubject).toBeNull();
    expect(getDb().select().from(sessions).where(eq(sessions.userId, dev.id)).all()).toHaveLength(0);
    const refusal = getDb().select().from(auditEvents).where(and(eq(auditEvents.action, "sign_in_refused"), eq(auditEvents.entityId, String(dev.id)))).get()!;
    expect(refusal.after).toMatchObject({ method: "sso", reason: "no_group", groups: [] });
    expect(refusal.summary).toBe("Single sign-on refused for dev.nogroup@example.test: none of the groups received matches a group rule (groups received: none)");
  });

  it("refuses a deactivated account and an unverified address", async () => {
    makeUser("researcher", { email: "fay.off@example.test", active: false, passwordHash: null });
    expect((await signInAs("fay")).refusal?.reason).toBe("deactivated");
    makeUser("researcher", { email: "gus.unverified@example.test", passwordHash: null });
    expect((await signInAs("gus")).refusal?.reason).toBe("email_unverified");
    const audited = getDb().select().from(auditEvents).where(eq(auditEvents.action, "sign_in_refused")).all().map((e) => (e.after as { reason: string }).reason);
    expect(audited).toEqual(expect.arrayContaining(["deactivated", "email_unverified"]));
  });

  it("links an active password account: its password and reset links stop working, and password sign-in is refused", async () => {
    const eli = makeUser("researcher", { email: "eli.active@example.test" });
    getDb().insert(userTokens).values({ userId: eli.id, kind: "password_reset", tokenHash: "x".repeat(64), expiresAt: new Date(Date.now() + 3_600_000) }).run();
    const linked = await signInAs("eli");
    expect(linked.session).toBeDefined();
    expect(getDb().select().from(userTokens).where(eq(userTokens.userId, eli.id)).get()!.usedAt).not.toBeNull();
    await expect(signInWithPassword(eli.email, TEST_PASSWORD, { clientIp: "10.0.0.1" })).rejects.toThrow(SSO_ACCOUNT_MESSAGE);
  });

  it("require single sign-on refuses every password but the break-glass administrator's, who cannot sign in with single sign-on", async () => {
    const other = makeUser("safety_officer");
    const breakGlass = makeUser("admin", { email: "hal.admin@example.test" });
    setSettings({ requireSso: true, breakGlassUserId: breakGlass.id });
    await expect(signInWithPassword(other.email, TEST_PASSWORD, { clientIp: "10.0.0.2" })).rejects.toThrow(SSO_REQUIRED_MESSAGE);
    await expect(signInWithPassword("nobody@example.test", TEST_PASSWORD, { clientIp: "10.0.0.2" })).rejects.toThrow(SSO_REQUIRED_MESSAGE);
    // A wrong password for the break-glass account looks like every other refusal.
    await expect(signInWithPassword(breakGlass.email, "wrong password", { clientIp: "10.0.0.2" })).rejects.toThrow(SSO_REQUIRED_MESSAGE);
    const signedIn = await signInWithPassword(breakGlass.email, TEST_PASSWORD, { clientIp: "10.0.0.2" });
    expect(signedIn.id).toBe(breakGlass.id);
    const audit = getDb().select().from(auditEvents).where(and(eq(auditEvents.action, "sign_in"), eq(auditEvents.entityId, String(breakGlass.id)))).get()!;
    expect(audit.after).toEqual({ ip: "10.0.0.2", method: "password" });
    expect(audit.summary).toBe("hal.admin@example.test signed in with a password");
    // While required, the break-glass administrator cannot be demoted or deactivated, and nobody else is invited with a password.
    const actor = { id: admin().id, email: admin().email, name: "Admin", role: "admin", sessionVersion: 1 } as never;
    expect(() => changeUserRole(actor, breakGlass.id, "auditor")).toThrow(/break-glass administrator while single sign-on is required/);
    expect(() => setUserActive(actor, breakGlass.id, false)).toThrow(/break-glass administrator while single sign-on is required/);
    await expect(inviteUser(actor, { email: "pw.person@example.test", name: "Pw Person", role: "researcher", signInMethod: "password" }, { clientIp: "10.0.0.3" })).rejects.toThrow(/invite the person to sign in with their institution/);
    // The break-glass account keeps its password: single sign-on does not link it.
    expect((await signInAs("hal")).refusal?.reason).toBe("break_glass");
    expect(getDb().select().from(users).where(eq(users.id, breakGlass.id)).get()!.passwordHash).not.toBeNull();
  });

  it("refuses to require single sign-on without a break-glass administrator who keeps a password, or without a provider", async () => {
    const researcher = makeUser("researcher");
    expect(() => setSettings({ requireSso: true, breakGlassUserId: researcher.id })).toThrow("The break-glass account must be an active administrator who signs in with a password.");
    const issuer = process.env.OIDC_ISSUER;
    delete process.env.OIDC_ISSUER;
    try {
      expect(() => setSettings({ requireSso: true, breakGlassUserId: admin().id })).toThrow(/no provider is configured/);
    } finally {
      process.env.OIDC_ISSUER = issuer;
    }
    const stored = getDb().select().from(settings).where(eq(settings.key, SSO_SETTINGS_KEY)).get()!.value as { requireSso: boolean };
    expect(stored.requireSso).toBe(false);
  });

  it("invites a person for single sign-on without a password link; their first sign-in links the account", async () => {
    const a = admin();
    const invited = await inviteUser({ id: a.id, email: a.email, name: a.name, role: "admin", sessionVersion: 1 } as never, {
      email: "Ben.Stranger@example.test",
      name: "Ben Stranger",
      role: "auditor",
      signInMethod: "sso",
    }, { clientIp: "10.0.0.9" });
    expect(invited).toMatchObject({ signInMethod: "sso", passwordHash: null, role: "auditor" });
    expect(getDb().select().from(userTokens).where(eq(userTokens.userId, invited.id)).all()).toHaveLength(0);
    const mail = getDb().select().from(emailMessages).where(eq(emailMessages.recipientUserId, invited.id)).get()!;
    expect(mail.subject).toBe("You are invited to Headroom");
    expect(mail.text).toContain("“Sign in with your institution”");
    expect(mail.text).toContain("http://localhost:3999/sign-in");
    expect(mail.text).not.toContain("/invitation/");
    // Password sign-in is refused before the first single sign-on too.
    await expect(signInWithPassword(invited.email, "anything at all", { clientIp: "10.0.0.9" })).rejects.toThrow(SSO_ACCOUNT_MESSAGE);
    const result = await signInAs("ben");
    expect(result.session).toBeDefined();
    // The group rule decides the role: lab-staff gives researcher.
    expect(getDb().select().from(users).where(eq(users.id, invited.id)).get()).toMatchObject({ ssoSubject: "ben", role: "researcher" });
  });

  it("answers a password reset for a single sign-on account with an e-mail that says it has no password", async () => {
    const ben = getDb().select().from(users).where(eq(users.email, "ben.stranger@example.test")).get()!;
    expect(await requestPasswordReset(ben.email, { clientIp: "10.0.0.10" })).toBe(true);
    const mails = getDb().select().from(emailMessages).where(eq(emailMessages.recipientUserId, ben.id)).all();
    const reset = mails.find((m) => m.kind === "password_reset")!;
    expect(reset.subject).toBe("Your Headroom account has no password");
    expect(reset.text).not.toContain("/reset-password/");
    expect(getDb().select().from(userTokens).where(eq(userTokens.userId, ben.id)).all()).toHaveLength(0);
  });
});
