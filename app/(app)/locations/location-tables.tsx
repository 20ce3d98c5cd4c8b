"use client";
import { useMemo } from "react";
import { DataTable } from "@/components/data-table";
import { getRoomColumns, getUnitColumns, roomFilters, unitFilters, type RoomRow, type UnitRow } from "./location-columns";

const roomColumns = getRoomColumns();
const unitColumns = getUnitColumns();

export function RoomsTable({ sites }: { sites: { id: number; name: string }[] }) {
  const filters = useMemo(() => roomFilters(sites), [sites]);
  return (
    <DataTable
      apiUrl="/api/v1/rooms"
      label="Rooms"
      columns={roomColumns}
      sortable={["code", "site", "designMaxTempC"]}
      defaultSort={{ id: "site", dir: "asc" }}
      filters={filters}
      rowKey={(row: RoomRow) => row.id}
      noun={{ one: "room", other: "rooms" }}
      emptyMessage="No room matches."
    />
  );
}

export function UnitsTable({ sites }: { sites: { id: number; name: string }[] }) {
  const filters = useMemo(() => unitFilters(sites), [sites]);
  return (
    <DataTable
      apiUrl="/api/v1/storage-units"
      label="Storage units"
      columns={unitColumns}
      sortable={["code", "room", "kind"]}
      defaultSort={{ id: "room", dir: "asc" }}
      filters={filters}
      rowKey={(row: UnitRow) => row.id}
      noun={{ one: "storage unit", other: "storage units" }}
      emptyMessage="No storage unit matches."
    />
  );
}
