import { Power, TriangleAlert } from "lucide-react";
import Link from "next/link";
import { createDataTableColumnHelper, type DataTableFilters } from "@/components/data-table";
import { formatDateTime, formatTempC } from "@/lib/format/numbers";
import type { SENSOR_SORT_KEYS } from "@/lib/temperatures/schemas";
import type { SensorListRow } from "@/lib/temperatures/sensors";

export type SensorRow = SensorListRow;

/** Column ids are the API's sort keys. */
export const SENSOR_SORTABLE = ["externalId", "name", "location", "lastReadingAt"] as const satisfies readonly (typeof SENSOR_SORT_KEYS)[number][];

export const SENSOR_FILTERS: DataTableFilters = {
  search: { label: "Search", placeholder: "Device id or name" },
  selects: [
    { param: "status", label: "Status", allLabel: "On and off", options: [{ value: "on", label: "Switched on" }, { value: "off", label: "Switched off" }] },
    { param: "excursion", label: "Excursions", allLabel: "Any", options: [{ value: "open", label: "With an open excursion" }] },
  ],
};

const column = createDataTableColumnHelper<SensorRow>();

export function getSensorColumns() {
  return column.columns([
    column.accessor("externalId", {
      id: "externalId",
      header: "Device id",
      meta: { rowHeader: true, className: "whitespace-nowrap" },
      cell: ({ row }) => (
        <Link href={`/temperatures/sensors/${row.original.id}`} className="font-mono text-accent-800 underline-offset-2 hover:underline">
          {row.original.externalId}
        </Link>
      ),
    }),
    column.accessor("name", { id: "name", header: "Name", meta: { priority: 2 } }),
    column.accessor((row) => row.unitCode ?? row.roomCode, {
      id: "location",
      header: "Location",
      meta: { className: "whitespace-nowrap" },
      cell: ({ row }) =>
        row.original.storageUnitId != null ? (
          <Link href={`/locations/units/${row.original.storageUnitId}`} className="hover:underline">
            Unit <span className="font-mono text-xs">{row.original.unitCode}</span> in <span className="font-mono text-xs">{row.original.roomCode}</span>
          </Link>
        ) : (
          <Link href={`/locations/rooms/${row.original.roomId}`} className="hover:underline">
            Room <span className="font-mono text-xs">{row.original.roomCode}</span>
          </Link>
        ),
    }),
    column.accessor("lastReadingAt", {
      id: "lastReadingAt",
      header: "Latest reading",
      meta: { className: "whitespace-nowrap" },
      cell: ({ row }) =>
        row.original.lastReadingAt == null ? (
          <span className="text-ink-500">none yet</span>
        ) : (
          <span>
            <span className="font-semibold">{formatTempC(row.original.lastReadingTempC)}</span> <span className="text-xs text-ink-600">{formatDateTime(row.original.lastReadingAt)}</span>
          </span>
        ),
    }),
    column.accessor("openExcursions", {
      id: "status",
      header: "Status",
      meta: { className: "whitespace-nowrap text-xs" },
      cell: ({ row }) => (
        <span className="inline-flex flex-wrap gap-x-3 gap-y-1">
          {row.original.openExcursions > 0 ? (
            <span className="inline-flex items-center gap-1 font-semibold text-sev-high">
              <TriangleAlert aria-hidden="true" className="size-3.5" /> Open excursion
            </span>
          ) : null}
          {row.original.active ? (
            row.original.openExcursions > 0 ? null : <span className="text-ink-600">Switched on</span>
          ) : (
            <span className="inline-flex items-center gap-1 text-ink-600">
              <Power aria-hidden="true" className="size-3" /> Switched off
            </span>
          )}
        </span>
      ),
    }),
  ]);
}
