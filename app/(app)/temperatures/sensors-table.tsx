"use client";
import { DataTable } from "@/components/data-table";
import { getSensorColumns, SENSOR_FILTERS, SENSOR_SORTABLE, type SensorRow } from "./sensor-columns";

const columns = getSensorColumns();
const defaultSort = { id: "externalId", dir: "asc" } as const;
const noun = { one: "sensor", other: "sensors" };
const rowKey = (row: SensorRow) => row.id;

export function SensorsTable() {
  return (
    <DataTable
      apiUrl="/api/v1/sensors"
      label="Sensors"
      columns={columns}
      sortable={SENSOR_SORTABLE}
      defaultSort={defaultSort}
      filters={SENSOR_FILTERS}
      rowKey={rowKey}
      noun={noun}
      emptyMessage="No sensor matches."
    />
  );
}
