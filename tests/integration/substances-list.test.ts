/**
 * The substance list's sorting, paging and filters over the seeded library. The expected orders
 * are computed here from the rows themselves, so the checks hold whatever the library holds.
 */
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { seedSubstanceLibrary } from "@/db/seed/substances";
import * as listRoute from "@/app/api/v1/substances/route";
import { ghsFlammableCategory } from "@/lib/hazard/classification";
import { call, makeUser, sessionCookieFor } from "./helpers/world";

type Summary = {
  id: number;
  name: string;
  cas: string | null;
  normalBoilingPointC: number | null;
  flashPointC: number | null;
  lflVolPercent: number | null;
  molarMassGPerMol: number;
  ghsFlammableCategory: number | null;
};

const SORT_KEYS = ["name", "cas", "normalBoilingPointC", "flashPointC", "lflVolPercent", "molarMassGPerMol"] as const;

let cookie: string;
let library: Summary[];

async function list(query: string) {
  return call(listRoute.GET, { path: `/api/v1/substances?${query}`, cookie });
}

/** The order the API promises: values in the asked direction, empty values last, then id the same way. */
function expectedOrder(rows: Summary[], key: (typeof SORT_KEYS)[number], dir: "asc" | "desc"): number[] {
  const sign = dir === "asc" ? 1 : -1;
  return [...rows]
    .sort((a, b) => {
      const va = a[key];
      const vb = b[key];
      if (va == null && vb == null) return sign * (a.id - b.id);
      if (va == null) return 1;
      if (vb == null) return -1;
      // SQLite compares text byte by byte (BINARY collation), which for these names is code-unit order.
      if (va < vb) return -sign;
      if (va > vb) return sign;
      return sign * (a.id - b.id);
    })
    .map((r) => r.id);
}

beforeAll(async () => {
  getDb().transaction((tx) => seedSubstanceLibrary(tx));
  cookie = await sessionCookieFor(makeUser("auditor"));
  const all = await list("pageSize=100");
  library = all.body.data;
});

describe("GET /api/v1/substances sorting", () => {
  it("has the seeded library to sort, with some empty values among the sortable columns", () => {
    expect(library).toHaveLength(43);
    const withEmpty = SORT_KEYS.filter((key) => library.some((row) => row[key] == null));
    expect(withEmpty.length).toBeGreaterThan(0);
  });

  for (const key of SORT_KEYS) {
    for (const dir of ["asc", "desc"] as const) {
      it(`sorts by ${key} ${dir}, empty values last`, async () => {
        const response = await list(`sort=${key}&dir=${dir}&pageSize=100`);
        expect(response.status).toBe(200);
        const ids = response.body.data.map((r: Summary) => r.id);
        expect(ids).toEqual(expectedOrder(library, key, dir));
        const values = response.body.data.map((r: Summary) => r[key]);
        const firstEmpty = values.findIndex((v: unknown) => v == null);
        if (firstEmpty >= 0) expect(values.slice(firstEmpty).every((v: unknown) => v == null)).toBe(true);
      });
    }
  }

  it("defaults to name ascending, as before", async () => {
    const response = await list("pageSize=100");
    expect(response.body.data.map((r: Summary) => r.id)).toEqual(expectedOrder(library, "name", "asc"));
  });

  it("puts the lowest flash point first ascending and the highest first descending", async () => {
    const up = await list("sort=flashPointC&dir=asc&pageSize=1");
    const down = await list("sort=flashPointC&dir=desc&pageSize=1");
    const flashPoints = library.map((r) => r.flashPointC).filter((v): v is number => v != null);
    expect(up.body.data[0].flashPointC).toBe(Math.min(...flashPoints));
    expect(down.body.data[0].flashPointC).toBe(Math.max(...flashPoints));
  });
});

describe("GET /api/v1/substances paging", () => {
  it("pages through a sorted list without gaps or repeats, with the same total on every page", async () => {
    const seen: number[] = [];
    for (let page = 1; page <= 5; page += 1) {
      const response = await list(`sort=lflVolPercent&dir=desc&page=${page}&pageSize=10`);
      expect(response.status).toBe(200);
      expect(response.body).toMatchObject({ page, pageSize: 10, total: 43 });
      expect(response.body.data).toHaveLength(page < 5 ? 10 : 3);
      seen.push(...response.body.data.map((r: Summary) => r.id));
    }
    expect(seen).toEqual(expectedOrder(library, "lflVolPercent", "desc"));
  });

  it("answers an empty page past the end, with the total", async () => {
    const response = await list("page=9&pageSize=10");
    expect(response.status).toBe(200);
    expect(response.body).toMatchObject({ data: [], page: 9, pageSize: 10, total: 43 });
  });

  it("counts the filtered rows, not the library, when searching", async () => {
    const response = await list("q=ethyl&sort=normalBoilingPointC&dir=desc&pageSize=2");
    expect(response.body.data).toHaveLength(2);
    expect(response.body.total).toBeGreaterThan(2);
    expect(response.body.total).toBeLessThan(43);
  });
});

describe("GET /api/v1/substances ghs filter", () => {
  it("keeps exactly the substances of the asked GHS category", async () => {
    let sum = 0;
    for (const ghs of ["1", "2", "3", "4", "none"] as const) {
      const response = await list(`ghs=${ghs}&pageSize=100`);
      expect(response.status).toBe(200);
      const expected = ghs === "none" ? null : Number(ghs);
      for (const row of response.body.data as Summary[]) {
        expect(row.ghsFlammableCategory).toBe(expected);
        if (expected != null) expect(ghsFlammableCategory(row.flashPointC!, row.normalBoilingPointC!)).toBe(expected);
      }
      expect(response.body.total).toBe(library.filter((r) => r.ghsFlammableCategory === expected).length);
      sum += response.body.total;
    }
    expect(sum).toBe(43);
  });
});

describe("GET /api/v1/substances bad list queries", () => {
  it("answers 400 for an unknown sort key, naming the allowed ones", async () => {
    const response = await list("sort=retiredAt");
    expect(response.status).toBe(400);
    expect(response.body.error.code).toBe("invalid_input");
    expect(Object.keys(response.body.error.fields)).toEqual(["sort"]);
    expect(response.body.error.fields.sort[0]).toBe(
      "sort must be one of: name, cas, normalBoilingPointC, flashPointC, lflVolPercent, molarMassGPerMol.",
    );
  });

  it("answers 400 for a direction other than asc or desc, and for an unknown GHS category", async () => {
    const response = await list("sort=name&dir=up&ghs=5");
    expect(response.status).toBe(400);
    expect(response.body.error.fields).toEqual({ dir: ["dir must be asc or desc."], ghs: ["ghs must be 1, 2, 3, 4 or none."] });
  });
});
