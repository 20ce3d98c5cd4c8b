import Link from "next/link";
import type { z } from "zod";
import { createDataTableColumnHelper, type DataTableFilters } from "@/components/data-table";
import { formatTempC } from "@/lib/format/numbers";
import type { substanceSummary } from "@/lib/substances/present";
import type { substanceListQuerySchema } from "@/lib/substances/schemas";

/** One row of `GET /api/v1/substances`. */
export type SubstanceRow = ReturnType<typeof substanceSummary>;

type SubstanceSortKey = z.output<typeof substanceListQuerySchema>["sort"];

/**
 * Column ids the API sorts by; the type keeps them in step with the API's schema. The API also
 * sorts by molar mass, which this table does not show.
 */
export const SUBSTANCE_SORTABLE = [
  "name",
  "cas",
  "normalBoilingPointC",
  "flashPointC",
  "lflVolPercent",
] as const satisfies readonly SubstanceSortKey[];

export const SUBSTANCE_FILTERS: DataTableFilters = {
  search: { label: "Search", placeholder: "Name, synonym or CAS number" },
  selects: [
    {
      param: "ghs",
      label: "GHS category",
      allLabel: "Any category",
      options: [
        { value: "1", label: "Cat. 1" },
        { value: "2", label: "Cat. 2" },
        { value: "3", label: "Cat. 3" },
        { value: "4", label: "Cat. 4" },
        { value: "none", label: "Not classified" },
      ],
    },
  ],
};

/** The unit sits in the header, so a cell shows the number alone (same rounding and minus sign as elsewhere). */
function tempValue(value: number | null): string {
  return formatTempC(value).replace(/ °C$/, "");
}

/**
 * Two significant figures, as the published LFLs carry them; trailing zeros kept (4.0, not 4) so
 * the column reads evenly.
 */
function lflValue(value: number | null): string {
  return value == null || !Number.isFinite(value) ? "—" : value.toPrecision(2);
}

/** H2O → H<sub>2</sub>O: a formula reads as chemists write it. */
function Formula({ formula }: { formula: string | null }) {
  if (!formula) return <span className="text-ink-400">—</span>;
  return (
    <span>
      {formula.split(/(\d+)/).map((part, i) => (/^\d+$/.test(part) ? <sub key={i}>{part}</sub> : <span key={i}>{part}</span>))}
    </span>
  );
}

const column = createDataTableColumnHelper<SubstanceRow>();

export function getSubstanceColumns() {
  return column.columns([
    column.accessor("name", {
      header: "Name",
      meta: { rowHeader: true, className: "min-w-40" },
      cell: ({ row }) => (
        <Link href={`/substances/${row.original.id}`} className="rounded-sm text-accent-800 underline-offset-2 hover:underline">
          {row.original.name}
        </Link>
      ),
    }),
    column.accessor("cas", {
      header: "CAS number",
      meta: { className: "whitespace-nowrap font-mono text-xs text-ink-800" },
      cell: ({ getValue }) => getValue() ?? "—",
    }),
    column.accessor("formula", {
      header: "Formula",
      meta: { className: "whitespace-nowrap", priority: 3 },
      cell: ({ getValue }) => <Formula formula={getValue()} />,
    }),
    column.accessor("normalBoilingPointC", {
      header: "Boiling point",
      meta: { align: "end", unit: "°C" },
      cell: ({ getValue }) => tempValue(getValue()),
    }),
    column.accessor("flashPointC", {
      header: "Flash point",
      meta: { align: "end", unit: "°C" },
      cell: ({ getValue }) => tempValue(getValue()),
    }),
    column.accessor("lflVolPercent", {
      header: "LFL",
      meta: { align: "end", unit: "% vol" },
      cell: ({ getValue }) => lflValue(getValue()),
    }),
    column.accessor("ghsFlammableCategory", {
      header: "GHS category",
      meta: { className: "whitespace-nowrap", priority: 2 },
      cell: ({ getValue }) => {
        const category = getValue();
        return category == null ? <span className="text-ink-500">—</span> : `Cat. ${category}`;
      },
    }),
    column.accessor("nfpaLiquidClass", {
      header: "NFPA class",
      meta: { className: "whitespace-nowrap", priority: 2 },
      cell: ({ getValue }) => getValue() ?? <span className="text-ink-500">—</span>,
    }),
  ]);
}
