"use client";
import { useMemo } from "react";
import { DataTable } from "@/components/data-table";
import { CONTAINER_TABLE_SORTABLE, containerFilters, getContainerColumns, type ContainerRow } from "./container-columns";

const columns = getContainerColumns();
const defaultSort = { id: "updatedAt", dir: "desc" } as const;
const noun = { one: "container", other: "containers" };
const rowKey = (row: ContainerRow) => row.id;

export function ContainersTable({ sites, showMine }: { sites: { id: number; name: string }[]; showMine: boolean }) {
  const filters = useMemo(() => containerFilters(sites, showMine), [sites, showMine]);
  return (
    <DataTable
      apiUrl="/api/v1/containers"
      label="Containers"
      columns={columns}
      sortable={CONTAINER_TABLE_SORTABLE}
      defaultSort={defaultSort}
      filters={filters}
      rowKey={rowKey}
      noun={noun}
      emptyMessage="No container matches."
    />
  );
}
