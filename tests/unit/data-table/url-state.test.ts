import { describe, expect, it } from "vitest";
import {
  apiSearchParams,
  applyTableChange,
  nextSort,
  pageCount,
  parseTableState,
  writeTableState,
  type TableUrlConfig,
} from "@/components/data-table/url-state";

const config: TableUrlConfig = {
  sortable: ["name", "flashPointC"],
  defaultSort: { id: "name", dir: "asc" },
  filters: {
    search: { label: "Search" },
    selects: [{ param: "ghs", label: "GHS category", options: [{ value: "1", label: "Cat. 1" }, { value: "none", label: "None" }] }],
  },
  pageSizes: [25, 50, 100],
};

const parse = (query: string) => parseTableState(new URLSearchParams(query), config);

describe("parseTableState", () => {
  it("gives the defaults for an empty query", () => {
    expect(parse("")).toEqual({ page: 1, pageSize: 25, sort: "name", dir: "asc", filters: {} });
  });

  it("reads every parameter it owns", () => {
    expect(parse("q=%20acet%20&ghs=1&sort=flashPointC&dir=desc&page=3&pageSize=50")).toEqual({
      page: 3,
      pageSize: 50,
      sort: "flashPointC",
      dir: "desc",
      filters: { q: "acet", ghs: "1" },
    });
  });

  it("falls back to the defaults for values that do not parse", () => {
    expect(parse("page=0&pageSize=30&sort=retiredAt&dir=up&ghs=7&q=%20%20")).toEqual({
      page: 1,
      pageSize: 25,
      sort: "name",
      dir: "asc",
      filters: {},
    });
    expect(parse("page=-2").page).toBe(1);
    expect(parse("page=2.5").page).toBe(1);
    expect(parse("page=abc").page).toBe(1);
  });

  it("uses the default direction only for the default sort column", () => {
    const descByDefault = { ...config, defaultSort: { id: "name", dir: "desc" as const } };
    expect(parseTableState(new URLSearchParams(""), descByDefault).dir).toBe("desc");
    expect(parseTableState(new URLSearchParams("sort=flashPointC"), descByDefault).dir).toBe("asc");
  });

  it("cuts an overlong search to 200 characters", () => {
    expect(parse(`q=${"a".repeat(300)}`).filters.q).toHaveLength(200);
  });
});

describe("writeTableState", () => {
  it("leaves defaults out of the URL", () => {
    expect(writeTableState(new URLSearchParams(""), parse(""), config).toString()).toBe("");
  });

  it("writes what differs from the defaults and round-trips", () => {
    const state = { page: 2, pageSize: 100, sort: "flashPointC", dir: "desc" as const, filters: { q: "ethyl acetate", ghs: "none" } };
    const written = writeTableState(new URLSearchParams(""), state, config);
    expect(written.toString()).toBe("q=ethyl+acetate&ghs=none&sort=flashPointC&dir=desc&page=2&pageSize=100");
    expect(parseTableState(written, config)).toEqual(state);
  });

  it("writes the direction of the default column when it is reversed", () => {
    const written = writeTableState(new URLSearchParams(""), { ...parse(""), dir: "desc" }, config);
    expect(written.toString()).toBe("sort=name&dir=desc");
  });

  it("keeps parameters it does not own and drops cleared filters", () => {
    const written = writeTableState(new URLSearchParams("tab=limits&q=old&page=4"), parse(""), config);
    expect(written.toString()).toBe("tab=limits");
  });
});

describe("apiSearchParams", () => {
  it("spells out every parameter for the API", () => {
    expect(apiSearchParams(parse("ghs=1")).toString()).toBe("ghs=1&sort=name&dir=asc&page=1&pageSize=25");
  });
});

describe("applyTableChange", () => {
  const onPage3 = parse("page=3&q=acet");

  it("moves between pages without touching the rest", () => {
    expect(applyTableChange(onPage3, { page: 4 })).toEqual({ ...onPage3, page: 4 });
    expect(applyTableChange(onPage3, { page: 0 }).page).toBe(1);
  });

  it("goes back to page 1 when a filter, the sort or the page size changes", () => {
    expect(applyTableChange(onPage3, { filters: { q: "ethanol" } })).toMatchObject({ page: 1, filters: { q: "ethanol" } });
    expect(applyTableChange(onPage3, { sort: "flashPointC", dir: "desc" })).toMatchObject({ page: 1, sort: "flashPointC", dir: "desc" });
    expect(applyTableChange(onPage3, { pageSize: 50 })).toMatchObject({ page: 1, pageSize: 50 });
  });

  it("removes a filter set to nothing", () => {
    expect(applyTableChange(onPage3, { filters: { q: undefined } }).filters).toEqual({});
    expect(applyTableChange(onPage3, { filters: { q: "" } }).filters).toEqual({});
  });
});

describe("nextSort and pageCount", () => {
  it("flips the sorted column and starts another ascending", () => {
    expect(nextSort({ sort: "name", dir: "asc" }, "name")).toEqual({ sort: "name", dir: "desc" });
    expect(nextSort({ sort: "name", dir: "desc" }, "name")).toEqual({ sort: "name", dir: "asc" });
    expect(nextSort({ sort: "name", dir: "desc" }, "flashPointC")).toEqual({ sort: "flashPointC", dir: "asc" });
  });

  it("counts at least one page", () => {
    expect(pageCount(0, 25)).toBe(1);
    expect(pageCount(25, 25)).toBe(1);
    expect(pageCount(26, 25)).toBe(2);
    expect(pageCount(1234, 100)).toBe(13);
  });
});
