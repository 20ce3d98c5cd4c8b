import type { ColumnPriority } from "./priority";
import { createColumnHelper, metaHelper, rowPaginationFeature, rowSortingFeature, tableFeatures, type ColumnDef, type RowData } from "@tanstack/react-table";

/** What a column tells the table about its presentation. */
export type DataTableColumnMeta = {
  /** "end" for numbers: right-aligned in tabular figures. */
  align?: "start" | "end";
  /** Shown after the header text in brackets, e.g. "°C" → "Flash point (°C)". */
  unit?: string;
  /** Render this column's cells as row headers (`<th scope="row">`), usually the name. */
  rowHeader?: boolean;
  /** Extra classes for the cells (width, monospace…). */
  className?: string;
  /**
   * 1 (the default) keeps the column at every width; 2–4 let it give way on a narrow table, its
   * value then shown under the row header (see `ColumnPriority`). Give the table a row header.
   */
  priority?: ColumnPriority;
  /** The name shown before the value under the row header; the header text unless given. */
  label?: string;
  /** false: leave a hidden column's value out of the line under the row header (it shows it already). */
  secondary?: boolean;
};

/**
 * The one feature set every list uses: sorting and paging state, both processed on the server
 * (the table runs in manual mode). Module scope, as TanStack Table v9 expects.
 */
export const dataTableFeatures = tableFeatures({
  rowSortingFeature,
  rowPaginationFeature,
  columnMeta: metaHelper<DataTableColumnMeta>(),
});

export type DataTableFeatures = typeof dataTableFeatures;

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- columns of one table carry different value types
export type DataTableColumn<Row extends RowData> = ColumnDef<DataTableFeatures, Row, any>;

/** The column helper for a list's `get<Thing>Columns()`. */
export function createDataTableColumnHelper<Row extends RowData>() {
  return createColumnHelper<DataTableFeatures, Row>();
}
