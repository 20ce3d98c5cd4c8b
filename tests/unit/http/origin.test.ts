import { describe, expect, it } from "vitest";
import { allowedOrigins, isSameOriginRequest, isStateChanging } from "@/lib/http/origin";
import { API_CONTENT_SECURITY_POLICY, commonSecurityHeaders, pageContentSecurityPolicy } from "@/lib/http/security-headers";

const APP = "https://headroom.lab.example";

function headers(values: Record<string, string>): Headers {
  return new Headers(values);
}

describe("origin check", () => {
  it("treats only GET, HEAD and OPTIONS as safe", () => {
    expect(["GET", "head", "OPTIONS"].map(isStateChanging)).toEqual([false, false, false]);
    expect(["POST", "PUT", "PATCH", "DELETE"].map(isStateChanging)).toEqual([true, true, true, true]);
  });

  it("accepts the app's own origin and refuses every other one", () => {
    expect(isSameOriginRequest(headers({ origin: APP }), APP, true)).toBe(true);
    expect(isSameOriginRequest(headers({ origin: "https://evil.example" }), APP, true)).toBe(false);
    expect(isSameOriginRequest(headers({ origin: "http://headroom.lab.example" }), APP, true)).toBe(false);
    expect(isSameOriginRequest(headers({ origin: "https://headroom.lab.example:8443" }), APP, true)).toBe(false);
    expect(isSameOriginRequest(headers({ origin: "null" }), APP, true)).toBe(false);
  });

  it("accepts localhost and 127.0.0.1 on the same port when the app runs on localhost", () => {
    expect([...allowedOrigins("http://localhost:3000", true)].sort()).toEqual(["http://127.0.0.1:3000", "http://localhost:3000"]);
    expect(isSameOriginRequest(headers({ origin: "http://localhost:3001" }), "http://localhost:3000", true)).toBe(false);
    expect([...allowedOrigins(APP, true)]).toEqual([APP]);
  });

  it("falls back to Sec-Fetch-Site when a browser sends no Origin", () => {
    expect(isSameOriginRequest(headers({ "sec-fetch-site": "same-origin" }), APP, true)).toBe(true);
    expect(isSameOriginRequest(headers({ "sec-fetch-site": "cross-site" }), APP, true)).toBe(false);
    expect(isSameOriginRequest(headers({ "sec-fetch-site": "same-site" }), APP, true)).toBe(false);
  });

  it("lets programs that send neither header through (no browser, no ambient cookie to abuse)", () => {
    expect(isSameOriginRequest(headers({}), APP, true)).toBe(true);
  });
});

describe("security headers", () => {
  it("gives pages a nonce-based script policy that forbids framing", () => {
    const policy = pageContentSecurityPolicy("abc123", { development: false, https: true });
    expect(policy).toContain("script-src 'self' 'nonce-abc123' 'strict-dynamic'");
    expect(policy).toContain("frame-ancestors 'none'");
    expect(policy).toContain("object-src 'none'");
    expect(policy).toContain("upgrade-insecure-requests");
    expect(policy).not.toContain("unsafe-eval");
    expect(pageContentSecurityPolicy("n", { development: true, https: false })).toContain("'unsafe-eval'");
  });

  it("sends HSTS in production only, and the other headers always", () => {
    const production = Object.fromEntries(commonSecurityHeaders({ production: true }).map((h) => [h.key, h.value]));
    expect(production["Strict-Transport-Security"]).toBe("max-age=31536000; includeSubDomains");
    expect(production["X-Content-Type-Options"]).toBe("nosniff");
    expect(production["Referrer-Policy"]).toBe("same-origin");
    expect(commonSecurityHeaders({ production: false }).map((h) => h.key)).not.toContain("Strict-Transport-Security");
    expect(API_CONTENT_SECURITY_POLICY).toContain("frame-ancestors 'none'");
  });
});
