import Link from "next/link";
import { createDataTableColumnHelper, type DataTableFilters } from "@/components/data-table";
import { SEVERITY_STYLE } from "@/components/ui/severity";
import type { Severity } from "@/db/enums";
import type { ContainerListRow } from "@/db/queries/container-list";
import { CONTAINER_STATE_LABELS } from "@/lib/format/container-labels";
import { formatNumber } from "@/lib/format/numbers";
import type { CONTAINER_SORTABLE } from "@/lib/inventory/schemas";

/** One row of `GET /api/v1/containers` (dates arrive as ISO strings). */
export type ContainerRow = Omit<ContainerListRow, "expiresAt" | "updatedAt"> & { expiresAt: string | null; updatedAt: string; openFindingSeverity: Severity | null };

/** A small severity mark (icon and word): the worst open finding the container contributes to. */
function FindingMark({ severity }: { severity: Severity | null }) {
  if (!severity)
    return (
      <span className="text-ink-400" title="No open finding in your view">
        —<span className="sr-only">No open finding in your view</span>
      </span>
    );
  const style = SEVERITY_STYLE[severity];
  const Icon = style.icon;
  return (
    <span className={`inline-flex items-center gap-1 text-xs font-semibold ${style.text}`} title={`Contributes to an open finding; the worst is ${style.label.toLowerCase()}`}>
      <Icon aria-hidden="true" className="size-3.5" strokeWidth={2.25} />
      {style.label}
    </span>
  );
}

export const CONTAINER_TABLE_SORTABLE = ["label", "substance", "amount", "state", "location", "owner", "updatedAt"] as const satisfies readonly (typeof CONTAINER_SORTABLE)[number][];

export function containerFilters(sites: { id: number; name: string }[], showMine: boolean): DataTableFilters {
  return {
    search: { label: "Search", placeholder: "Label, substance or CAS number" },
    selects: [
      {
        param: "state",
        label: "State",
        allLabel: "Not disposed",
        options: [
          { value: "sealed", label: "Sealed" },
          { value: "opened", label: "Opened" },
          { value: "in_use", label: "In use" },
          { value: "empty", label: "Empty" },
          { value: "disposed", label: "Disposed of" },
          { value: "all", label: "All, disposed too" },
        ],
      },
      { param: "siteId", label: "Site", allLabel: "All sites", options: sites.map((s) => ({ value: String(s.id), label: s.name })) },
      ...(showMine ? [{ param: "mine", label: "Owner", allLabel: "Anyone", options: [{ value: "1", label: "Mine" }] }] : []),
    ],
  };
}

const column = createDataTableColumnHelper<ContainerRow>();

export function getContainerColumns() {
  return column.columns([
    column.accessor("label", {
      id: "label",
      header: "Label",
      meta: { rowHeader: true, className: "whitespace-nowrap font-mono" },
      cell: ({ row }) => (
        <Link href={`/inventory/${row.original.id}`} className="text-accent-800 underline-offset-2 hover:underline">
          {row.original.label}
        </Link>
      ),
    }),
    column.accessor((row) => row.substanceName ?? row.mixtureName, {
      id: "substance",
      header: "Contents",
      meta: { className: "min-w-40" },
      cell: ({ row }) =>
        row.original.substanceId ? (
          <span>
            {row.original.substanceName}
            {row.original.substanceCas ? <span className="ml-1.5 font-mono text-xs text-ink-500">{row.original.substanceCas}</span> : null}
          </span>
        ) : (
          <span>{row.original.mixtureName} <span className="text-xs text-ink-500">(mixture)</span></span>
        ),
    }),
    column.accessor("amount", {
      id: "amount",
      header: "Amount",
      meta: { align: "end", className: "whitespace-nowrap" },
      cell: ({ row }) => `${formatNumber(row.original.amount)} ${row.original.amountUnit}`,
    }),
    column.accessor("state", {
      id: "state",
      header: "State",
      meta: { priority: 2 },
      cell: ({ getValue }) => CONTAINER_STATE_LABELS[getValue()],
    }),
    column.accessor((row) => `${row.siteName} ${row.roomCode} ${row.unitCode}`, {
      id: "location",
      header: "Location",
      meta: { className: "whitespace-nowrap" },
      cell: ({ row }) => (
        <Link href={`/locations/units/${row.original.storageUnitId}`} className="hover:underline">
          <span className="text-ink-600">{row.original.siteName} · </span>
          <span className="font-mono text-xs">
            {row.original.roomCode} / {row.original.unitCode}
          </span>
        </Link>
      ),
    }),
    column.accessor("ownerName", { id: "owner", header: "Owner", meta: { priority: 2 }, cell: ({ getValue }) => getValue() ?? "—" }),
    column.display({
      id: "findings",
      header: "Open findings",
      meta: { className: "whitespace-nowrap" },
      cell: ({ row }) => <FindingMark severity={row.original.openFindingSeverity ?? null} />,
    }),
    column.accessor("updatedAt", {
      id: "updatedAt",
      header: "Changed",
      meta: { className: "whitespace-nowrap text-xs text-ink-600", priority: 3 },
      cell: ({ getValue }) => getValue().slice(0, 10),
    }),
  ]);
}
