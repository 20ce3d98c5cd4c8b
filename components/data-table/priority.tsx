import type { ReactNode } from "react";

/**
 * How much a column matters when the table is narrow. 1: always shown (the name and the key
 * figures). 2, 3, 4: shown from a table width of 56, 64 and 72 rem; below it the column gives way
 * and its value moves to a line under the row's key cell, so nothing needs sideways scrolling.
 *
 * The table's own width decides (a container query), not the window's: the same list is wider on
 * a tablet without the side menu than on a laptop beside it, and narrower beside a side panel.
 */
export type ColumnPriority = 1 | 2 | 3 | 4;

/** The container every prioritised table sits in. */
export const TABLE_CONTAINER_CLASS = "@container/table";

// Written out in full so Tailwind finds each class in the source.
const CELL_CLASS: Record<ColumnPriority, string> = {
  1: "",
  2: "hidden @4xl/table:table-cell",
  3: "hidden @5xl/table:table-cell",
  4: "hidden @6xl/table:table-cell",
};

const LINE_ITEM_CLASS: Record<ColumnPriority, string> = {
  1: "hidden",
  2: "@4xl/table:hidden",
  3: "@5xl/table:hidden",
  4: "@6xl/table:hidden",
};

/** Classes for what stands in for a column with this priority while it is hidden (shown below its width). */
export function priorityStandInClass(priority: ColumnPriority): string {
  return LINE_ITEM_CLASS[priority];
}

/** Classes for a header or body cell of a column with this priority. */
export function priorityCellClass(priority: ColumnPriority | undefined): string {
  return CELL_CLASS[priority ?? 1];
}

export type SecondaryValue = {
  key: string;
  /** The column's header, with its unit in brackets as the header shows it. */
  label: string;
  value: ReactNode;
  priority: ColumnPriority;
};

/**
 * The values of the columns that gave way, under the row's key cell: "Site: North Campus ·
 * Kind: Laboratory". Each value shows exactly while its column is hidden.
 */
export function SecondaryValues({ items }: { items: SecondaryValue[] }) {
  const shown = items.filter((item) => item.priority > 1);
  if (shown.length === 0) return null;
  const widest = Math.max(...shown.map((item) => item.priority)) as ColumnPriority;
  return (
    <span className={`mt-0.5 flex flex-wrap gap-x-3 gap-y-0.5 font-sans text-xs font-normal whitespace-normal text-ink-600 ${LINE_ITEM_CLASS[widest]}`}>
      {shown.map((item) => (
        <span key={item.key} className={LINE_ITEM_CLASS[item.priority]}>
          <span className="text-ink-500">{item.label}:</span> <span className="text-ink-800">{item.value}</span>
        </span>
      ))}
    </span>
  );
}
