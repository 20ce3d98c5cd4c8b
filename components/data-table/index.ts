export { DataTable, type DataTableProps } from "./data-table";
export { createDataTableColumnHelper, dataTableFeatures, type DataTableColumn, type DataTableColumnMeta, type DataTableFeatures } from "./features";
export type { DataTableFilters, SelectFilter, SortDir } from "./url-state";
export { priorityCellClass, priorityStandInClass, SecondaryValues, TABLE_CONTAINER_CLASS, type ColumnPriority, type SecondaryValue } from "./priority";
