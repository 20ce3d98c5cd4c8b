/**
 * The substance API over the seeded library. Check values:
 *  - acetone Psat at 20 °C: 180 mmHg = 24.0 kPa, NTP Chemical Repository data sheet (Radian Corp.,
 *    1991). The sheet gives two significant figures and older tables run a few per cent below modern
 *    correlations, so the tolerance here is 4 %; the engine's own tests check correlations within 2 %.
 *  - saturated ppm = 10⁶·Psat/Patm (Dalton's law).
 */
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { seedSubstanceLibrary } from "@/db/seed/substances";
import * as listRoute from "@/app/api/v1/substances/route";
import * as detailRoute from "@/app/api/v1/substances/[id]/route";
import * as vaporRoute from "@/app/api/v1/substances/[id]/vapor-pressure/route";
import { call, makeUser, sessionCookieFor } from "./helpers/world";

let cookie: string;
let acetoneId: number;

beforeAll(async () => {
  getDb().transaction((tx) => seedSubstanceLibrary(tx));
  cookie = await sessionCookieFor(makeUser("researcher"));
  const found = await call(listRoute.GET, { path: "/api/v1/substances?cas=67-64-1", cookie });
  acetoneId = found.body.data[0].id;
});

describe("GET /api/v1/substances", () => {
  it("pages through the whole library with a total", async () => {
    const first = await call(listRoute.GET, { path: "/api/v1/substances?page=1&pageSize=20", cookie });
    expect(first.status).toBe(200);
    expect(first.body.total).toBe(43);
    expect(first.body.page).toBe(1);
    expect(first.body.pageSize).toBe(20);
    expect(first.body.data).toHaveLength(20);
    const last = await call(listRoute.GET, { path: "/api/v1/substances?page=3&pageSize=20", cookie });
    expect(last.body.data).toHaveLength(3);
    const names = [...first.body.data, ...last.body.data].map((s: { name: string }) => s.name);
    expect(new Set(names).size).toBe(names.length);
  });

  it("finds by name, synonym and CAS number", async () => {
    const byName = await call(listRoute.GET, { path: "/api/v1/substances?q=ACETONE", cookie });
    expect(byName.body.data.map((s: { cas: string }) => s.cas)).toContain("67-64-1");
    const bySynonym = await call(listRoute.GET, { path: "/api/v1/substances?q=dimethyl%20ketone", cookie });
    expect(bySynonym.body.data[0].cas).toBe("67-64-1");
    const byCas = await call(listRoute.GET, { path: "/api/v1/substances?cas=64-17-5", cookie });
    expect(byCas.body.total).toBe(1);
    expect(byCas.body.data[0]).toMatchObject({ name: "ethanol", ghsFlammableCategory: 2, nfpaLiquidClass: "IB" });
    const none = await call(listRoute.GET, { path: "/api/v1/substances?q=%25%25", cookie });
    expect(none.body.total).toBe(0);
  });

  it("answers 400 with field errors for bad paging or a malformed CAS number", async () => {
    const response = await call(listRoute.GET, { path: "/api/v1/substances?page=0&pageSize=500&cas=abc", cookie });
    expect(response.status).toBe(400);
    expect(Object.keys(response.body.error.fields).sort()).toEqual(["cas", "page", "pageSize"]);
  });
});

describe("GET /api/v1/substances/{id}", () => {
  it("returns every value with its source", async () => {
    const response = await call(detailRoute.GET, { path: `/api/v1/substances/${acetoneId}`, cookie, params: { id: String(acetoneId) } });
    expect(response.status).toBe(200);
    const acetone = response.body.data;
    expect(acetone).toMatchObject({ cas: "67-64-1", flashPointC: -20, lflVolPercent: 2.5, normalBoilingPointC: 56.08 });
    for (const field of ["molarMassGPerMol", "normalBoilingPointC", "flashPointC", "lflVolPercent"]) {
      expect(acetone.sources[field], field).toBeTruthy();
    }
    expect(acetone.exposureLimits.length).toBeGreaterThan(0);
    expect(acetone.exposureLimits.every((l: { source: string }) => l.source.length > 0)).toBe(true);
    expect(acetone.correlations[0].tMinC).toBeLessThan(20);
  });

  it("answers 404 for an unknown or malformed id", async () => {
    for (const id of ["999999", "abc", "-1"]) {
      const response = await call(detailRoute.GET, { cookie, params: { id } });
      expect(response.status).toBe(404);
      expect(response.body.error.code).toBe("not_found");
    }
  });
});

describe("GET /api/v1/substances/{id}/vapor-pressure", () => {
  it("returns Psat and the saturated concentration at tempC", async () => {
    const response = await call(vaporRoute.GET, { path: `/api/v1/substances/${acetoneId}/vapor-pressure?tempC=20`, cookie, params: { id: String(acetoneId) } });
    expect(response.status).toBe(200);
    expect(response.body.method).toBe("wagner");
    expect(response.body.extrapolated).toBe(false);
    expect(Math.abs(response.body.pressureKPa / 24.0 - 1)).toBeLessThan(0.04);
    expect(response.body.saturatedConcentration.ppm).toBeCloseTo((response.body.pressureKPa / 101.325) * 1e6, 0);
    expect(response.body.saturatedConcentration.boils).toBe(false);
  });

  it("reports boiling above the boiling point at a lower ambient pressure", async () => {
    // Acetone boils at 56.1 °C at 101.325 kPa, lower at 90 kPa (Clausius–Clapeyron); 60 °C is above both.
    const response = await call(vaporRoute.GET, { path: `/api/v1/substances/${acetoneId}/vapor-pressure?tempC=60&ambientPressureKPa=90`, cookie, params: { id: String(acetoneId) } });
    expect(response.status).toBe(200);
    expect(response.body.ambientPressureKPa).toBe(90);
    expect(response.body.saturatedConcentration.boils).toBe(true);
    expect(response.body.saturatedConcentration.volumePercent).toBe(100);
  });

  it.each([
    ["", "tempC"],
    ["tempC=", "tempC"],
    ["tempC=warm", "tempC"],
    ["tempC=-300", "tempC"],
    ["tempC=20&ambientPressureKPa=5", "ambientPressureKPa"],
  ])("answers 400 with a field error for ?%s", async (query, field) => {
    const response = await call(vaporRoute.GET, { path: `/api/v1/substances/${acetoneId}/vapor-pressure?${query}`, cookie, params: { id: String(acetoneId) } });
    expect(response.status).toBe(400);
    expect(response.body.error.fields[field]).toBeDefined();
  });
});
