import { describe, expect, it } from "vitest";
import { safeRedirectPath } from "@/lib/http/redirects";

describe("safeRedirectPath", () => {
  it.each([
    ["/", "/"],
    ["/register?severity=critical", "/register?severity=critical"],
    ["/inventory/12#history", "/inventory/12#history"],
    ["/locations/rooms/3", "/locations/rooms/3"],
  ])("keeps the in-app path %s", (target, expected) => {
    expect(safeRedirectPath(target)).toBe(expected);
  });

  it.each([
    ["//evil.example/phish"],
    ["/\\evil.example/phish"],
    ["/%5Cevil.example/phish"],
    ["/%2F%2Fevil.example"],
    ["/\t/evil.example"],
    ["/\n/evil.example"],
    ["https://evil.example/"],
    ["javascript:alert(1)"],
    ["evil.example"],
    [""],
    ["/%E0%A4%A"],
    [undefined],
    [42],
  ])("refuses %j", (target) => {
    expect(safeRedirectPath(target)).toBe("/");
  });

  it("gives the fallback it is told", () => {
    expect(safeRedirectPath("//x", "/sign-in")).toBe("/sign-in");
  });
});
