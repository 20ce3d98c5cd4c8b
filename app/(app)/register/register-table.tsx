"use client";
import { useMemo } from "react";
import { DataTable, type DataTableFilters } from "@/components/data-table";
import { getRegisterColumns, REGISTER_SORTABLE, type RegisterRow } from "./register-columns";
import { useStepsTaken } from "./selection";

const defaultSort = { id: "severity", dir: "desc" } as const;
const noun = { one: "finding", other: "findings" };
const rowKey = (row: RegisterRow) => row.id;

/**
 * Every finding, one row each. With `selectable`, each row and the page have a checkbox for the
 * step on many findings at once; after a step the page is read again.
 */
export function RegisterTable({ filters, ruleLabels, selectable = false }: { filters: DataTableFilters; ruleLabels: Record<string, string>; selectable?: boolean }) {
  const columns = useMemo(() => getRegisterColumns(ruleLabels, selectable), [ruleLabels, selectable]);
  const stepsTaken = useStepsTaken();
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
      version={stepsTaken}
    />
  );
}
