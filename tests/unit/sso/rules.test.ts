import { describe, expect, it } from "vitest";
import { emailDomain, groupsFromClaim, isLoopbackHost, issuerProblem, jitAllowed, roleForGroups } from "@/lib/sso/rules";
import { ssoSettingsSchema } from "@/lib/sso/schemas";

describe("roleForGroups", () => {
  const rules = [
    { group: "safety-office", role: "safety_officer" as const },
    { group: "lab-staff", role: "researcher" as const },
    { group: "estates", role: "facilities" as const },
  ];

  it("takes the first rule in the admins' order, not the person's order of groups", () => {
    expect(roleForGroups(rules, ["lab-staff", "safety-office"])).toEqual({ group: "safety-office", role: "safety_officer" });
    expect(roleForGroups(rules, ["estates", "lab-staff"])).toEqual({ group: "lab-staff", role: "researcher" });
  });

  it("gives nothing when no group matches, or with no rules", () => {
    expect(roleForGroups(rules, ["visitors"])).toBeNull();
    expect(roleForGroups(rules, [])).toBeNull();
    expect(roleForGroups([], ["lab-staff"])).toBeNull();
  });

  it("matches group names exactly (case and whole name)", () => {
    expect(roleForGroups(rules, ["Lab-Staff", "lab-staff-2", "lab"])).toBeNull();
  });
});

describe("jitAllowed", () => {
  it("opens only the listed domains, exactly", () => {
    expect(emailDomain("Ines.Calloway@Example.ORG")).toBe("example.org");
    expect(jitAllowed(["example.org"], "ines@EXAMPLE.org")).toBe(true);
    expect(jitAllowed(["example.org"], "ines@lab.example.org")).toBe(false);
    expect(jitAllowed(["example.org"], "ines@example.org.evil.test")).toBe(false);
    expect(jitAllowed(["example.org"], "example.org")).toBe(false);
    expect(jitAllowed([], "ines@example.org")).toBe(false);
  });
});

describe("issuerProblem", () => {
  it("accepts https anywhere and plain http only on this machine", () => {
    expect(issuerProblem("https://login.example.org")).toBeNull();
    expect(issuerProblem("https://login.example.org/realms/lab/")).toBeNull();
    expect(issuerProblem("http://localhost:3026")).toBeNull();
    expect(issuerProblem("http://127.0.0.1:3026")).toBeNull();
    expect(issuerProblem("http://[::1]:3026")).toBeNull();
    expect(isLoopbackHost("127.0.0.2")).toBe(true);
  });

  it("refuses plain http elsewhere, other schemes, credentials and rubbish", () => {
    expect(issuerProblem("http://login.example.org")).toMatch(/must use https/);
    expect(issuerProblem("http://localhost.example.org")).toMatch(/must use https/);
    expect(issuerProblem("http://10.0.0.5")).toMatch(/must use https/);
    expect(issuerProblem("ftp://login.example.org")).toMatch(/must use https/);
    expect(issuerProblem("https://user:pw@login.example.org")).toMatch(/user name or password/);
    expect(issuerProblem("https://login.example.org/?x=1")).toMatch(/query or fragment/);
    expect(issuerProblem("login.example.org")).toMatch(/must be an address/);
  });
});

describe("groupsFromClaim", () => {
  it("reads a list or a single string and drops everything else", () => {
    expect(groupsFromClaim(["a", "", 3, "b"])).toEqual(["a", "b"]);
    expect(groupsFromClaim("a")).toEqual(["a"]);
    expect(groupsFromClaim(undefined)).toEqual([]);
    expect(groupsFromClaim({ a: 1 })).toEqual([]);
  });
});

describe("ssoSettingsSchema", () => {
  it("reads the form: rules in order, domains from free text, the switch", () => {
    const parsed = ssoSettingsSchema.parse({
      mappings: [{ group: " lab-staff ", role: "researcher" }],
      jitDomains: "Example.org,\n @lab.example.org  example.org",
      requireSso: "on",
      breakGlassUserId: "4",
    });
    expect(parsed).toEqual({ mappings: [{ group: "lab-staff", role: "researcher" }], jitDomains: ["example.org", "lab.example.org"], requireSso: true, breakGlassUserId: 4 });
  });

  it("refuses a repeated group, a bad domain, an unknown role, and requiring single sign-on without a break-glass account", () => {
    const problems = (input: unknown) => ssoSettingsSchema.safeParse(input).error?.issues.map((i) => i.message) ?? [];
    expect(problems({ mappings: [{ group: "a", role: "researcher" }, { group: "a", role: "admin" }] })).toEqual(["The group “a” is listed twice; only the first would ever count."]);
    expect(problems({ jitDomains: "example" })).toEqual(["“example” is not a domain; write it like lab.example.org, without the @."]);
    expect(problems({ mappings: [{ group: "a", role: "owner" }] })).toEqual(["Choose a role for this group."]);
    expect(problems({ requireSso: "on" })).toEqual(["Choose the administrator who keeps a password (the break-glass account)."]);
  });
});
