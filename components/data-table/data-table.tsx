"use client";

import { functionalUpdate, useTable, type PaginationState, type RowData, type SortingState } from "@tanstack/react-table";
import { ArrowDown, ArrowUp, ArrowUpDown, RotateCw } from "lucide-react";
import { usePathname, useRouter, useSearchParams } from "next/navigation";
import { useCallback, useEffect, useId, useMemo } from "react";
import { formatCount } from "@/lib/format/numbers";
import { dataTableFeatures, type DataTableColumn } from "./features";
import { DataTablePagination } from "./data-table-pagination";
import { DataTableToolbar } from "./data-table-toolbar";
import { priorityCellClass, priorityStandInClass, SecondaryValues, TABLE_CONTAINER_CLASS, type ColumnPriority, type SecondaryValue } from "./priority";
import { controlClass } from "./search-box";
import { useListPage } from "./use-list-page";
import {
  DEFAULT_PAGE_SIZES,
  apiSearchParams,
  applyTableChange,
  hasActiveFilters,
  nextSort,
  pageCount as countPages,
  parseTableState,
  writeTableState,
  type DataTableFilters,
  type SortDir,
  type TableChange,
  type TableUrlConfig,
} from "./url-state";

export type DataTableProps<Row extends RowData> = {
  /** The list endpoint, e.g. "/api/v1/substances"; it answers `{ data, page, pageSize, total }`. */
  apiUrl: string;
  /** Built by the page's `get<Thing>Columns()`; keep the array stable (module scope or memo). */
  columns: DataTableColumn<Row>[];
  /** Column ids the API can sort by; a column's id is the API's sort key. */
  sortable: readonly string[];
  defaultSort: { id: string; dir?: SortDir };
  filters?: DataTableFilters;
  rowKey: (row: Row) => string | number;
  /** The table's accessible name, e.g. "Substances". */
  label: string;
  /** What a row is, for "43 substances match"; "row"/"rows" unless given. */
  noun?: { one: string; other: string };
  /** Shown when nothing matches. */
  emptyMessage?: string;
  pageSizes?: readonly number[];
  /** Raise it when the rows changed on the server by other means (a step on selected rows): the page is fetched again. */
  version?: number;
};

const NO_FILTERS: DataTableFilters = {};
const ROWS_NOUN = { one: "row", other: "rows" };

function ariaSort(sorted: boolean, dir: SortDir): "ascending" | "descending" | "none" {
  if (!sorted) return "none";
  return dir === "asc" ? "ascending" : "descending";
}

/** A column's name in words: its label, else its header text, with the unit in brackets. */
function columnName(column: { id: string; columnDef: { header?: unknown; meta?: { label?: string; unit?: string } } }): string {
  const { header, meta } = column.columnDef;
  const name = meta?.label ?? (typeof header === "string" ? header : column.id);
  return meta?.unit ? `${name} (${meta.unit})` : name;
}

function matchText(total: number, noun: { one: string; other: string }): string {
  if (total === 0) return `No ${noun.other} match`;
  return total === 1 ? `1 ${noun.one} matches` : `${formatCount(total)} ${noun.other} match`;
}

/**
 * The one table for every list: paging, sorting and filtering happen on the server, and the
 * state lives in the page's URL so a view can be bookmarked, shared and reloaded. Changes replace
 * the history entry rather than stacking one per keystroke or page.
 */
export function DataTable<Row extends RowData>({
  apiUrl,
  columns,
  sortable,
  defaultSort,
  filters = NO_FILTERS,
  rowKey,
  label,
  noun = ROWS_NOUN,
  emptyMessage = "Nothing matches these filters.",
  pageSizes = DEFAULT_PAGE_SIZES,
  version = 0,
}: DataTableProps<Row>) {
  const router = useRouter();
  const pathname = usePathname();
  const searchParams = useSearchParams();
  const captionId = useId();
  const countId = useId();

  const defaultSortId = defaultSort.id;
  const defaultSortDir = defaultSort.dir ?? "asc";
  const config = useMemo<TableUrlConfig>(
    () => ({ sortable, defaultSort: { id: defaultSortId, dir: defaultSortDir }, filters, pageSizes }),
    [sortable, defaultSortId, defaultSortDir, filters, pageSizes],
  );
  const state = useMemo(() => parseTableState(searchParams, config), [searchParams, config]);

  const update = useCallback(
    (change: TableChange) => {
      const next = writeTableState(searchParams, applyTableChange(state, change), config).toString();
      router.replace(next ? `${pathname}?${next}` : pathname, { scroll: false });
    },
    [searchParams, state, config, router, pathname],
  );
  const onFilterChange = useCallback((param: string, value: string) => update({ filters: { [param]: value } }), [update]);

  const requestUrl = `${apiUrl}?${apiSearchParams(state).toString()}`;
  const { page: result, error, loading, retry } = useListPage<Row>(requestUrl, version);
  const rows = result?.data ?? (EMPTY_ROWS as Row[]);
  const total = result?.total ?? 0;
  const pages = countPages(total, state.pageSize);

  // A page past the end (rows were removed, or an old link): go to the last page there is.
  useEffect(() => {
    if (!loading && result && result.total > 0 && state.page > pages) update({ page: pages });
  }, [loading, result, state.page, pages, update]);

  const sorting = useMemo<SortingState>(() => [{ id: state.sort, desc: state.dir === "desc" }], [state.sort, state.dir]);
  const pagination = useMemo<PaginationState>(() => ({ pageIndex: state.page - 1, pageSize: state.pageSize }), [state.page, state.pageSize]);

  const table = useTable({
    features: dataTableFeatures,
    columns,
    data: rows,
    getRowId: (row) => String(rowKey(row)),
    state: { sorting, pagination },
    onSortingChange: (updater) => {
      const [first] = functionalUpdate(updater, sorting);
      if (first) update({ sort: first.id, dir: first.desc ? "desc" : "asc" });
    },
    onPaginationChange: (updater) => {
      const next = functionalUpdate(updater, pagination);
      if (next.pageSize !== pagination.pageSize) update({ pageSize: next.pageSize });
      else if (next.pageIndex !== pagination.pageIndex) update({ page: next.pageIndex + 1 });
    },
    manualSorting: true,
    manualPagination: true,
    autoResetPageIndex: false,
    enableMultiSort: false,
    enableSortingRemoval: false,
    rowCount: total,
  });

  const visibleColumns = table.getAllLeafColumns().length;
  // A narrow table hides some sortable columns' headers: a "Sort by" choice stands in for them.
  const sortChoices = table
    .getAllLeafColumns()
    .filter((column) => sortable.includes(column.id))
    .map((column) => ({ id: column.id, name: columnName(column), priority: column.columnDef.meta?.priority ?? 1 }));
  const sortStandIn = Math.max(1, ...sortChoices.map((choice) => choice.priority)) as ColumnPriority;
  const firstLoad = loading && !result;
  const countText = firstLoad ? "Loading…" : error && !result ? "" : matchText(total, noun);

  return (
    <div className={`${TABLE_CONTAINER_CLASS} rounded-lg border border-ink-200 bg-white`}>
      <DataTableToolbar filters={filters} values={state.filters} onChange={onFilterChange} />

      <div className="flex flex-wrap items-center justify-between gap-3 px-3 py-2 text-sm">
        <p className="flex items-baseline gap-3">
          <span id={countId} aria-live="polite" className="tabular font-medium text-ink-800">
            {countText}
          </span>
          {loading && !firstLoad ? (
            <span className="text-xs text-ink-500" aria-hidden="true">
              Updating…
            </span>
          ) : null}
        </p>
        {sortStandIn > 1 ? (
          <label className={`flex items-center gap-2 text-xs font-medium text-ink-700 ${priorityStandInClass(sortStandIn)}`}>
            Sort by
            <select
              value={`${state.sort}:${state.dir}`}
              onChange={(event) => {
                const [sort, dir] = event.target.value.split(":");
                table.setSorting([{ id: sort, desc: dir === "desc" }]);
              }}
              className={`${controlClass} h-8 pr-8`}
            >
              {sortChoices.flatMap((choice) => [
                <option key={`${choice.id}:asc`} value={`${choice.id}:asc`}>
                  {choice.name}, ascending
                </option>,
                <option key={`${choice.id}:desc`} value={`${choice.id}:desc`}>
                  {choice.name}, descending
                </option>,
              ])}
            </select>
          </label>
        ) : null}
      </div>

      {error ? (
        <div role="alert" className="mx-3 mb-3 flex flex-wrap items-center justify-between gap-3 rounded-md border border-sev-critical/30 bg-sev-critical-bg px-3 py-2.5 text-sm text-sev-critical">
          <p className="flex items-start gap-2">
            <span aria-hidden="true">⚠</span>
            <span>The list could not be loaded: {error}</span>
          </p>
          <button
            type="button"
            onClick={retry}
            className="inline-flex h-8 items-center gap-1.5 rounded-md border border-ink-300 bg-white px-3 text-sm font-medium text-ink-900 hover:bg-ink-100"
          >
            <RotateCw aria-hidden="true" className="size-3.5" />
            Try again
          </button>
        </div>
      ) : null}

      <div
        role="region"
        aria-labelledby={captionId}
        tabIndex={0}
        className="max-h-[70vh] overflow-auto border-t border-ink-200 focus-visible:outline-offset-[-2px]"
      >
        <table className="w-full border-separate border-spacing-0 text-sm" aria-describedby={countId} aria-busy={loading}>
          <caption id={captionId} className="sr-only">
            {label}
          </caption>
          <thead>
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => {
                  const meta = header.column.columnDef.meta;
                  const end = meta?.align === "end";
                  const canSort = sortable.includes(header.column.id);
                  const sorted = state.sort === header.column.id;
                  const SortIcon = !sorted ? ArrowUpDown : state.dir === "asc" ? ArrowUp : ArrowDown;
                  const content = header.isPlaceholder ? null : (
                    <>
                      <table.FlexRender header={header} />
                      {meta?.unit ? <span className="font-normal text-ink-500"> ({meta.unit})</span> : null}
                    </>
                  );
                  return (
                    <th
                      key={header.id}
                      scope="col"
                      colSpan={header.colSpan > 1 ? header.colSpan : undefined}
                      aria-sort={canSort ? ariaSort(sorted, state.dir) : undefined}
                      className={`sticky top-0 whitespace-nowrap bg-ink-50 px-3 py-0 text-xs font-semibold text-ink-700 shadow-[inset_0_-1px_0_var(--color-ink-200)] ${meta?.rowHeader ? "left-0 z-20" : "z-10"} ${end ? "text-right" : "text-left"} ${priorityCellClass(meta?.priority)}`}
                    >
                      {canSort ? (
                        <button
                          type="button"
                          onClick={() => {
                            const next = nextSort(state, header.column.id);
                            table.setSorting([{ id: next.sort, desc: next.dir === "desc" }]);
                          }}
                          className={`-mx-1.5 inline-flex items-center gap-1 rounded px-1.5 py-2 hover:bg-ink-100 hover:text-ink-950 focus-visible:outline-offset-[-2px] ${end ? "flex-row-reverse" : ""} ${sorted ? "text-ink-950" : ""}`}
                        >
                          <span>{content}</span>
                          <SortIcon aria-hidden="true" className={`size-3.5 shrink-0 ${sorted ? "text-accent-700" : "text-ink-400"}`} />
                        </button>
                      ) : (
                        <span className="inline-block py-2">{content}</span>
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody className={`tabular transition-opacity ${(loading || error) && result ? "opacity-50" : ""}`}>
            {firstLoad ? (
              <tr>
                <td colSpan={visibleColumns} className="px-3 py-10 text-center text-ink-500">
                  Loading…
                </td>
              </tr>
            ) : rows.length === 0 && !error ? (
              <tr>
                <td colSpan={visibleColumns} className="px-3 py-10 text-center">
                  <p className="font-medium text-ink-800">{total === 0 ? emptyMessage : "This page is empty."}</p>
                  {hasActiveFilters(state) ? (
                    <button
                      type="button"
                      onClick={() => update({ filters: Object.fromEntries(Object.keys(state.filters).map((name) => [name, undefined])) })}
                      className="mt-2 text-sm font-medium text-accent-700 underline-offset-2 hover:underline"
                    >
                      Clear filters
                    </button>
                  ) : null}
                </td>
              </tr>
            ) : (
              table.getRowModel().rows.map((row) => (
                <tr key={row.id} className="group hover:bg-accent-50">
                  {row.getAllCells().map((cell) => {
                    const meta = cell.column.columnDef.meta;
                    const className = `border-b border-ink-100 px-3 py-1.5 align-baseline ${meta?.align === "end" ? "text-right whitespace-nowrap" : "text-left"} ${meta?.className ?? ""} ${priorityCellClass(meta?.priority)}`;
                    return meta?.rowHeader ? (
                      // The row header stays in view when the table scrolls sideways on a narrow screen,
                      // and carries the values of the columns a narrow table leaves out.
                      <th key={cell.id} scope="row" className={`${className} sticky left-0 z-[1] bg-white font-medium group-hover:bg-accent-50`}>
                        <table.FlexRender cell={cell} />
                        <SecondaryValues
                          items={row.getAllCells().flatMap((other): SecondaryValue[] => {
                            const otherMeta = other.column.columnDef.meta;
                            const priority = otherMeta?.priority ?? 1;
                            if (priority === 1 || otherMeta?.secondary === false) return [];
                            return [{ key: other.id, label: columnName(other.column), value: <table.FlexRender cell={other} />, priority }];
                          })}
                        />
                      </th>
                    ) : (
                      <td key={cell.id} className={className}>
                        <table.FlexRender cell={cell} />
                      </td>
                    );
                  })}
                </tr>
              ))
            )}
          </tbody>
        </table>
      </div>

      <DataTablePagination
        page={state.page}
        pageCount={pages}
        pageSize={state.pageSize}
        pageSizes={pageSizes}
        onPage={(page) => table.setPageIndex(page - 1)}
        onPageSize={(size) => table.setPageSize(size)}
      />
    </div>
  );
}

const EMPTY_ROWS: never[] = [];
