"use client";
import { useMemo } from "react";
import { DataTable, type DataTableFilters } from "@/components/data-table";
import { getRegisterColumns, REGISTER_SORTABLE, type RegisterRow } from "./register-columns";

const defaultSort = { id: "severity", dir: "desc" } as const;
const noun = { one: "finding", other: "findings" };
const rowKey = (row: RegisterRow) => row.id;

export function RegisterTable({ filters, ruleLabels }: { filters: DataTableFilters; ruleLabels: Record<string, string> }) {
  const columns = useMemo(() => getRegisterColumns(ruleLabels), [ruleLabels]);
  return (
    <DataTable
      apiUrl="/api/v1/findings"
      label="Findings"
      columns={columns}
      sortable={REGISTER_SORTABLE}
      defaultSort={defaultSort}
      filters={filters}
      rowKey={rowKey}
      noun={noun}
      emptyMessage="No finding matches these filters."
    />
  );
}
