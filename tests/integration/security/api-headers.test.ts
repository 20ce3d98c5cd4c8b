/**
 * Every API answer carries the security headers itself: the proxy in front of the pages does not
 * run for /api/ (it would copy and cut request bodies at 10 MB), so the route wrappers set them.
 */
import { describe, expect, it } from "vitest";
import * as healthRoute from "@/app/api/health/route";
import * as containersRoute from "@/app/api/v1/containers/route";
import * as readingsRoute from "@/app/api/v1/readings/route";
import * as unknownRoute from "@/app/api/v1/[...path]/route";
import { API_CONTENT_SECURITY_POLICY } from "@/lib/http/security-headers";
import { call, makeUser, sessionCookieFor } from "../helpers/world";

function expectSecured(headers: Headers) {
  expect(headers.get("content-security-policy")).toBe(API_CONTENT_SECURITY_POLICY);
  expect(headers.get("x-content-type-options")).toBe("nosniff");
  expect(headers.get("referrer-policy")).toBe("same-origin");
  expect(headers.get("x-frame-options")).toBe("DENY");
}

describe("API answers carry the security headers", () => {
  it("on a public route, a session route (answer and refusal), a key route and an unknown path", async () => {
    expectSecured((await call(healthRoute.GET, { path: "/api/health" })).headers);

    const cookie = await sessionCookieFor(makeUser("researcher"));
    const listed = await call(containersRoute.GET, { path: "/api/v1/containers", cookie });
    expect(listed.status).toBe(200);
    expectSecured(listed.headers);
    const anonymous = await call(containersRoute.GET, { path: "/api/v1/containers" });
    expect(anonymous.status).toBe(401);
    expectSecured(anonymous.headers);

    const keyless = await call(readingsRoute.POST, { method: "POST", path: "/api/v1/readings", body: { readings: [] } });
    expect(keyless.status).toBe(401);
    expectSecured(keyless.headers);

    const unknown = await call(async () => unknownRoute.GET(), { path: "/api/v1/no-such-thing", params: { path: "no-such-thing" } });
    expect(unknown.status).toBe(404);
    expectSecured(unknown.headers);
  });
});
