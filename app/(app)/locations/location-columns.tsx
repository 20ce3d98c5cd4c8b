import Link from "next/link";
import { createDataTableColumnHelper, type DataTableFilters } from "@/components/data-table";
import { ROOM_KINDS, STORAGE_UNIT_KINDS, type RoomKind, type StorageUnitKind } from "@/db/enums";
import { ROOM_KIND_LABELS, STORAGE_UNIT_KIND_LABELS } from "@/lib/format/labels";
import { formatNumber, formatTempC } from "@/lib/format/numbers";

export type RoomRow = {
  id: number;
  siteId: number;
  siteName: string;
  code: string;
  name: string;
  kind: RoomKind;
  volumeM3: number | null;
  airChangesPerHour: number | null;
  designMaxTempC: number | null;
  sprinklered: boolean;
};

export type UnitRow = {
  id: number;
  roomId: number;
  roomCode: string;
  siteName: string;
  code: string;
  name: string;
  kind: StorageUnitKind;
  internalVolumeL: number | null;
  setMinC: number | null;
  setMaxC: number | null;
  ignitionSourceFree: boolean;
  ventilated: boolean;
};

const plain = (value: number | null) => (value == null ? "—" : formatNumber(value));
const temp = (value: number | null) => formatTempC(value).replace(/ °C$/, "");

export function roomFilters(sites: { id: number; name: string }[]): DataTableFilters {
  return {
    search: { label: "Search", placeholder: "Room code or name" },
    selects: [
      { param: "siteId", label: "Site", allLabel: "All sites", options: sites.map((s) => ({ value: String(s.id), label: s.name })) },
      { param: "kind", label: "Kind", allLabel: "All kinds", options: ROOM_KINDS.map((k) => ({ value: k, label: ROOM_KIND_LABELS[k] })) },
    ],
  };
}

export function unitFilters(sites: { id: number; name: string }[]): DataTableFilters {
  return {
    search: { label: "Search", placeholder: "Unit code or name" },
    selects: [
      { param: "siteId", label: "Site", allLabel: "All sites", options: sites.map((s) => ({ value: String(s.id), label: s.name })) },
      { param: "kind", label: "Kind", allLabel: "All kinds", options: STORAGE_UNIT_KINDS.map((k) => ({ value: k, label: STORAGE_UNIT_KIND_LABELS[k] })) },
    ],
  };
}

const room = createDataTableColumnHelper<RoomRow>();
export function getRoomColumns() {
  return room.columns([
    room.accessor("code", {
      id: "code",
      header: "Room",
      meta: { rowHeader: true, className: "whitespace-nowrap" },
      cell: ({ row }) => (
        <Link href={`/locations/rooms/${row.original.id}`} className="text-accent-800 underline-offset-2 hover:underline">
          <span className="font-mono">{row.original.code}</span> {row.original.name}
        </Link>
      ),
    }),
    room.accessor("siteName", { id: "site", header: "Site", meta: { className: "whitespace-nowrap", priority: 2 } }),
    room.accessor("kind", { id: "kind", header: "Kind", meta: { priority: 2 }, cell: ({ getValue }) => ROOM_KIND_LABELS[getValue()] }),
    room.accessor("volumeM3", { id: "volumeM3", header: "Volume", meta: { align: "end", unit: "m³" }, cell: ({ getValue }) => plain(getValue()) }),
    room.accessor("airChangesPerHour", { id: "ach", header: "Ventilation", meta: { align: "end", unit: "air changes/h" }, cell: ({ getValue }) => plain(getValue()) }),
    room.accessor("designMaxTempC", { id: "designMaxTempC", header: "Design maximum", meta: { align: "end", unit: "°C" }, cell: ({ getValue }) => temp(getValue()) }),
    room.accessor("sprinklered", { id: "sprinklered", header: "Sprinklered", meta: { priority: 3 }, cell: ({ getValue }) => (getValue() ? "Yes" : "No") }),
  ]);
}

const unit = createDataTableColumnHelper<UnitRow>();
export function getUnitColumns() {
  return unit.columns([
    unit.accessor("code", {
      id: "code",
      header: "Unit",
      meta: { rowHeader: true, className: "whitespace-nowrap" },
      cell: ({ row }) => (
        <Link href={`/locations/units/${row.original.id}`} className="text-accent-800 underline-offset-2 hover:underline">
          <span className="font-mono">{row.original.code}</span> {row.original.name}
        </Link>
      ),
    }),
    unit.accessor((row) => `${row.siteName} ${row.roomCode}`, {
      id: "room",
      header: "Room",
      meta: { className: "whitespace-nowrap" },
      cell: ({ row }) => (
        <Link href={`/locations/rooms/${row.original.roomId}`} className="hover:underline">
          {row.original.siteName} · <span className="font-mono text-xs">{row.original.roomCode}</span>
        </Link>
      ),
    }),
    unit.accessor("kind", { id: "kind", header: "Kind", meta: { priority: 2 }, cell: ({ getValue }) => STORAGE_UNIT_KIND_LABELS[getValue()] }),
    unit.accessor("internalVolumeL", { id: "volume", header: "Internal volume", meta: { align: "end", unit: "L" }, cell: ({ getValue }) => plain(getValue()) }),
    unit.accessor((row) => (row.setMaxC == null ? "—" : `${temp(row.setMinC)} … ${temp(row.setMaxC)}`), { id: "setRange", header: "Set range", meta: { unit: "°C", className: "whitespace-nowrap" } }),
    unit.accessor("ignitionSourceFree", {
      id: "interior",
      header: "Interior",
      meta: { className: "text-xs", priority: 3 },
      cell: ({ row }) => `${row.original.ignitionSourceFree ? "Free of ignition sources" : "May hold ignition sources"}${row.original.ventilated ? " · ventilated" : ""}`,
    }),
  ]);
}
