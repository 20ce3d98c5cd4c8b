import Link from "next/link";
import { createDataTableColumnHelper, type DataTableFilters } from "@/components/data-table";
import { SeverityBadge } from "@/components/ui/severity";
import { FINDING_STATUSES, SCENARIOS, SEVERITIES } from "@/db/enums";
import type { FindingListRow } from "@/db/queries/findings";
import { formatDurationMin, formatNumber, formatTempC } from "@/lib/format/numbers";
import { humaniseRule, SCENARIO_LABELS, STATUS_LABELS } from "@/lib/register/labels";
import { FINDING_SEARCH_MAX_LENGTH } from "@/lib/register/schemas";
import { SelectBox } from "./selection";

/** A row of `GET /api/v1/findings` as JSON (dates arrive as strings). */
export type RegisterRow = Omit<FindingListRow, "firstRaisedAt" | "updatedAt"> & { firstRaisedAt: string; updatedAt: string };

export const REGISTER_SORTABLE = ["severity", "status", "rule", "location", "ratio", "worstCaseTempC", "timeToDanger", "age"] as const;

type Option = { value: string; label: string };

/** The register's search box, the same in every view. */
export const FINDING_SEARCH = { label: "Search", placeholder: "Words, room or unit code (B-014, FR-1)", maxLength: FINDING_SEARCH_MAX_LENGTH };

export function registerFilters(rules: Option[], sites: Option[], locations: { room: Option; units: Option[] }[] = []): DataTableFilters {
  return {
    search: FINDING_SEARCH,
    selects: [
      { param: "severity", label: "Severity", allLabel: "Any severity", options: [{ value: "critical,high", label: "Critical or high" }, ...SEVERITIES.map((s) => ({ value: s, label: s.charAt(0).toUpperCase() + s.slice(1) }))] },
      {
        param: "status",
        label: "Status",
        allLabel: "Default view",
        options: [{ value: "open,acknowledged,mitigating", label: "Needs work" }, { value: "all", label: "Any status" }, ...FINDING_STATUSES.map((s) => ({ value: s, label: STATUS_LABELS[s] }))],
      },
      { param: "scenario", label: "Scenario", allLabel: "Any scenario", options: SCENARIOS.map((s) => ({ value: s, label: SCENARIO_LABELS[s] })) },
      ...(rules.length ? [{ param: "rule", label: "Rule", allLabel: "Any rule", options: rules }] : []),
      ...(sites.length > 1 ? [{ param: "siteId", label: "Site", allLabel: "Every site", options: sites }] : []),
      // A room includes its units' findings.
      ...(locations.length ? [{ param: "roomId", label: "Room", allLabel: "Every room", options: locations.map((l) => l.room) }] : []),
      ...(locations.length ? [{ param: "storageUnitId", label: "Unit", allLabel: "Every unit", options: locations.flatMap((l) => l.units.map((u) => ({ value: u.value, label: `${l.room.label.split(" ")[0]} › ${u.label}` }))) }] : []),
    ],
  };
}

function ageText(iso: string): string {
  const days = Math.floor((Date.now() - Date.parse(iso)) / 86_400_000);
  if (days < 1) return "today";
  return days === 1 ? "1 day" : `${days} days`;
}

const column = createDataTableColumnHelper<RegisterRow>();

/** A checkbox per finding and one for the page, when the person may take a step on many at once. */
const selectColumn = column.display({
  id: "select",
  header: ({ table }) => <SelectBox ids={table.getRowModel().rows.map((row) => row.original.id)} label="Select every finding on this page" />,
  meta: { label: "Select", secondary: false, className: "w-9" },
  cell: ({ row }) => <SelectBox ids={[row.original.id]} label={`Select: ${row.original.title}`} />,
});

export function getRegisterColumns(ruleLabels: Record<string, string>, selectable = false) {
  return column.columns([
    ...(selectable ? [selectColumn] : []),
    column.accessor("severity", { header: "Severity", cell: ({ row }) => <SeverityBadge severity={row.original.severity} /> }),
    column.accessor("title", {
      header: "Finding",
      meta: { rowHeader: true, className: "min-w-64" },
      cell: ({ row }) => (
        <>
          <Link href={`/register/${row.original.id}`} className="rounded-sm text-accent-800 underline-offset-2 hover:underline">
            {row.original.title}
          </Link>
          <span className="block text-xs text-ink-600">{row.original.location.label}</span>
        </>
      ),
    }),
    column.display({
      id: "valueLimit",
      header: "Value / limit",
      meta: { align: "end" },
      cell: ({ row }) => {
        const f = row.original;
        if (f.value == null) return <span className="text-ink-400">—</span>;
        return (
          <span className="whitespace-nowrap">
            {formatNumber(f.value)}
            {f.limit != null ? ` / ${formatNumber(f.limit)}` : ""} {f.unit ?? ""}
          </span>
        );
      },
    }),
    column.accessor("worstCaseTempC", {
      header: "Worst case",
      meta: { align: "end", unit: "°C" },
      cell: ({ row }) => <span title={row.original.worstCaseSource ?? undefined}>{formatTempC(row.original.worstCaseTempC).replace(/ °C$/, "")}</span>,
    }),
    column.accessor((r) => r.timeToDanger?.minutes ?? null, {
      id: "timeToDanger",
      header: "Time to danger",
      meta: { align: "end", priority: 3 },
      cell: ({ row }) => {
        const t = row.original.timeToDanger;
        if (t == null) return <span className="text-ink-400">—</span>;
        return <span title={`${t.threshold} at ${formatTempC(t.tempC)} after a failure`}>{t.minutes === 0 ? "now" : formatDurationMin(t.minutes)}</span>;
      },
    }),
    column.accessor("ratio", {
      header: "Ratio",
      meta: { align: "end", unit: "%", priority: 2 },
      cell: ({ row }) => (row.original.ratio == null ? "—" : formatNumber(row.original.ratio * 100)),
    }),
    column.accessor("status", { header: "Status", meta: { priority: 2 }, cell: ({ row }) => STATUS_LABELS[row.original.status as keyof typeof STATUS_LABELS] ?? row.original.status }),
    column.accessor("rule", { header: "Rule", meta: { priority: 3 }, cell: ({ row }) => ruleLabels[row.original.rule] ?? humaniseRule(row.original.rule) }),
    column.display({
      id: "location",
      header: "Location",
      // The finding's cell names its location already.
      meta: { priority: 4, secondary: false },
      cell: ({ row }) => {
        const l = row.original.location;
        const href = l.storageUnitId ? `/locations/units/${l.storageUnitId}` : l.roomId ? `/locations/rooms/${l.roomId}` : null;
        return href ? (
          <Link href={href} className="text-accent-800 underline-offset-2 hover:underline">
            {l.label}
          </Link>
        ) : (
          l.label
        );
      },
    }),
    column.display({
      id: "substance",
      header: "Substance",
      meta: { priority: 4 },
      cell: ({ row }) => row.original.substance?.name ?? row.original.mixture?.name ?? <span className="text-ink-400">—</span>,
    }),
    column.accessor("firstRaisedAt", { id: "age", header: "Age", meta: { align: "end", priority: 3 }, cell: ({ row }) => ageText(row.original.firstRaisedAt) }),
  ]);
}
