export { DataTable, type DataTableProps } from "./data-table";
export { createDataTableColumnHelper, dataTableFeatures, type DataTableColumn, type DataTableColumnMeta, type DataTableFeatures } from "./features";
export type { DataTableFilters, SelectFilter, SortDir } from "./url-state";
