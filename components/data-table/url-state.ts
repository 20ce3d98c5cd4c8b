/**
 * A list's state in the URL, and back: page, pageSize, sort, dir, the search text `q` and the
 * select filters. Pure functions, so the rules are tested without a browser. Values that do not
 * parse fall back to the defaults instead of breaking the page; defaults are left out of the URL
 * so a plain list has a plain address.
 */

export type SortDir = "asc" | "desc";

export type SelectFilter = {
  /** The query parameter, the same name in the page URL and the API. */
  param: string;
  label: string;
  options: readonly { value: string; label: string }[];
  /** The label of the empty choice; "All" unless given. */
  allLabel?: string;
};

export type DataTableFilters = {
  /** A search box bound to `q`. */
  search?: { label: string; placeholder?: string; maxLength?: number };
  selects?: readonly SelectFilter[];
};

export type TableUrlConfig = {
  sortable: readonly string[];
  defaultSort: { id: string; dir: SortDir };
  filters: DataTableFilters;
  pageSizes: readonly number[];
};

export type TableUrlState = {
  page: number;
  pageSize: number;
  sort: string;
  dir: SortDir;
  /** Only filters with a value; keyed by query parameter. */
  filters: Record<string, string>;
};

export const SEARCH_PARAM = "q";
export const DEFAULT_PAGE_SIZES = [25, 50, 100] as const;
export const SEARCH_MAX_LENGTH = 200;

type ParamReader = { get(name: string): string | null };

export function filterParams(config: Pick<TableUrlConfig, "filters">): string[] {
  return [...(config.filters.search ? [SEARCH_PARAM] : []), ...(config.filters.selects ?? []).map((s) => s.param)];
}

function ownedParams(config: TableUrlConfig): string[] {
  return [...filterParams(config), "sort", "dir", "page", "pageSize"];
}

function wholeNumber(text: string | null): number | null {
  if (text == null || !/^\d{1,9}$/.test(text.trim())) return null;
  return Number(text.trim());
}

export function parseTableState(params: ParamReader, config: TableUrlConfig): TableUrlState {
  const page = wholeNumber(params.get("page"));
  const pageSize = wholeNumber(params.get("pageSize"));
  const sortParam = params.get("sort");
  const sort = sortParam != null && config.sortable.includes(sortParam) ? sortParam : config.defaultSort.id;
  const dirParam = params.get("dir");
  const dir: SortDir =
    dirParam === "asc" || dirParam === "desc" ? dirParam : sort === config.defaultSort.id ? config.defaultSort.dir : "asc";

  const filters: Record<string, string> = {};
  if (config.filters.search) {
    const q = params.get(SEARCH_PARAM)?.trim().slice(0, SEARCH_MAX_LENGTH);
    if (q) filters[SEARCH_PARAM] = q;
  }
  for (const select of config.filters.selects ?? []) {
    const value = params.get(select.param);
    if (value != null && select.options.some((o) => o.value === value)) filters[select.param] = value;
  }

  return {
    page: page != null && page >= 1 ? page : 1,
    pageSize: pageSize != null && config.pageSizes.includes(pageSize) ? pageSize : config.pageSizes[0],
    sort,
    dir,
    filters,
  };
}

/**
 * The page's query string for a state: parameters the table does not own are kept as they were;
 * its own are written only when they differ from the defaults.
 */
export function writeTableState(current: ParamReader & { toString(): string }, state: TableUrlState, config: TableUrlConfig): URLSearchParams {
  const next = new URLSearchParams(current.toString());
  for (const name of ownedParams(config)) next.delete(name);
  for (const name of filterParams(config)) {
    const value = state.filters[name];
    if (value) next.set(name, value);
  }
  const isDefaultSort = state.sort === config.defaultSort.id && state.dir === config.defaultSort.dir;
  if (!isDefaultSort) {
    next.set("sort", state.sort);
    next.set("dir", state.dir);
  }
  if (state.page !== 1) next.set("page", String(state.page));
  if (state.pageSize !== config.pageSizes[0]) next.set("pageSize", String(state.pageSize));
  return next;
}

/** The API's query string: every parameter spelled out, so the answer does not rest on the server's defaults. */
export function apiSearchParams(state: TableUrlState): URLSearchParams {
  const params = new URLSearchParams();
  for (const [name, value] of Object.entries(state.filters)) if (value) params.set(name, value);
  params.set("sort", state.sort);
  params.set("dir", state.dir);
  params.set("page", String(state.page));
  params.set("pageSize", String(state.pageSize));
  return params;
}

export type TableChange = Partial<Pick<TableUrlState, "page" | "pageSize" | "sort" | "dir">> & {
  filters?: Record<string, string | undefined>;
};

/** Applies a change; anything but a page change goes back to page 1, since the old page no longer means anything. */
export function applyTableChange(state: TableUrlState, change: TableChange): TableUrlState {
  const filters = { ...state.filters };
  for (const [name, value] of Object.entries(change.filters ?? {})) {
    if (value) filters[name] = value;
    else delete filters[name];
  }
  const onlyPage = Object.keys(change).every((key) => key === "page");
  return {
    page: onlyPage ? Math.max(1, change.page ?? state.page) : 1,
    pageSize: change.pageSize ?? state.pageSize,
    sort: change.sort ?? state.sort,
    dir: change.dir ?? state.dir,
    filters,
  };
}

/** The next sort when a header is pressed: the same column flips; another column starts ascending. */
export function nextSort(state: Pick<TableUrlState, "sort" | "dir">, columnId: string): { sort: string; dir: SortDir } {
  if (state.sort === columnId) return { sort: columnId, dir: state.dir === "asc" ? "desc" : "asc" };
  return { sort: columnId, dir: "asc" };
}

export function pageCount(total: number, pageSize: number): number {
  return Math.max(1, Math.ceil(total / pageSize));
}

export function hasActiveFilters(state: TableUrlState): boolean {
  return Object.keys(state.filters).length > 0;
}
