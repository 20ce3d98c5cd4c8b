"use client";

import { DataTable } from "@/components/data-table";
import { getSubstanceColumns, SUBSTANCE_FILTERS, SUBSTANCE_SORTABLE, type SubstanceRow } from "./substance-columns";

const columns = getSubstanceColumns();
const defaultSort = { id: "name", dir: "asc" } as const;
const noun = { one: "substance", other: "substances" };
const rowKey = (row: SubstanceRow) => row.id;

export function SubstancesTable() {
  return (
    <DataTable
      apiUrl="/api/v1/substances"
      label="Substances"
      columns={columns}
      sortable={SUBSTANCE_SORTABLE}
      defaultSort={defaultSort}
      filters={SUBSTANCE_FILTERS}
      rowKey={rowKey}
      noun={noun}
      emptyMessage="No substance in the library matches."
    />
  );
}
