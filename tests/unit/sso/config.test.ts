import { afterEach, describe, expect, it } from "vitest";
import { oidcRedirectUri, oidcSettings } from "@/lib/config";

const saved = { ...process.env };

afterEach(() => {
  for (const key of ["OIDC_ISSUER", "OIDC_CLIENT_ID", "OIDC_CLIENT_SECRET", "APP_URL"]) {
    if (saved[key] === undefined) delete process.env[key];
    else process.env[key] = saved[key];
  }
});

describe("oidcSettings", () => {
  it("is off without OIDC_ISSUER, and reads the three settings when set", () => {
    delete process.env.OIDC_ISSUER;
    expect(oidcSettings()).toBeNull();
    process.env.OIDC_ISSUER = "https://login.example.org/realms/lab";
    process.env.OIDC_CLIENT_ID = "headroom";
    process.env.OIDC_CLIENT_SECRET = "s3cret";
    expect(oidcSettings()).toEqual({ issuer: "https://login.example.org/realms/lab", clientId: "headroom", clientSecret: "s3cret" });
  });

  it("refuses a missing client id or secret and a plain-http issuer off this machine", () => {
    process.env.OIDC_ISSUER = "https://login.example.org";
    delete process.env.OIDC_CLIENT_ID;
    process.env.OIDC_CLIENT_SECRET = "s3cret";
    expect(() => oidcSettings()).toThrow("OIDC_CLIENT_ID is not set; it is required when OIDC_ISSUER is set.");
    process.env.OIDC_CLIENT_ID = "headroom";
    delete process.env.OIDC_CLIENT_SECRET;
    expect(() => oidcSettings()).toThrow("OIDC_CLIENT_SECRET is not set; it is required when OIDC_ISSUER is set.");
    process.env.OIDC_CLIENT_SECRET = "s3cret";
    process.env.OIDC_ISSUER = "http://login.example.org";
    expect(() => oidcSettings()).toThrow(/must use https/);
    process.env.OIDC_ISSUER = "http://localhost:3026";
    expect(oidcSettings()?.issuer).toBe("http://localhost:3026");
  });

  it("builds the redirect URI from APP_URL", () => {
    process.env.APP_URL = "https://headroom.lab.example.org/";
    expect(oidcRedirectUri()).toBe("https://headroom.lab.example.org/sso/callback");
  });
});
