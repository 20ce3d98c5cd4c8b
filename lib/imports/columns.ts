/** Column descriptions shared by the validators, the templates and the import page. */
import { ImportFileError } from "./errors";
import type { ParsedRow, ParsedTable } from "./parse";

export type ColumnType = "text" | "number" | "date" | "choice" | "yes_no" | "email";

export type ImportColumn = {
  /** Header name, snake_case. */
  name: string;
  /** The column must be present and every row must fill it (conditions are in the description). */
  required: boolean;
  description: string;
  /** Invented example value. */
  example: string;
  type: ColumnType;
  /** For choice columns: the accepted values. */
  choices?: readonly string[];
};

export type ImportIssue = {
  /** Row number as a spreadsheet program shows it. */
  line: number;
  /** Header name of the cell at fault. */
  column: string;
  /** The cell as it was in the file. */
  value: string;
  message: string;
};

/** Collects issues for one file; kept in the order found (by line, then by column). */
export class IssueList {
  readonly items: ImportIssue[] = [];
  private readonly badLines = new Set<number>();

  add(row: ParsedRow, column: string, message: string, value = row.cells[column] ?? ""): void {
    this.items.push({ line: row.line, column, value, message });
    this.badLines.add(row.line);
  }

  has(line: number): boolean {
    return this.badLines.has(line);
  }
}

/** A row with more values than the header has names usually hides an unquoted comma. */
export function reportExtraCells(table: ParsedTable, row: ParsedRow, issues: IssueList): void {
  if (!row.extraCells) return;
  const { headers } = table;
  const extra = `(extra: “${row.extraCells.filter((v) => v !== "").join("”, “")}”)`;
  issues.add(
    row,
    headers[headers.length - 1] ?? "",
    table.format === "csv"
      ? `This row has ${headers.length + row.extraCells.length} values but the header names ${headers.length} ` +
          `columns ${extra}. A value that contains the delimiter must be in double quotes.`
      : `This row has values to the right of the last named column ${extra}. Name their column or delete them.`,
    row.extraCells.join(","),
  );
}

function editDistance(a: string, b: string): number {
  const prev = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    let diagonal = prev[0];
    prev[0] = i;
    for (let j = 1; j <= b.length; j++) {
      const above = prev[j];
      prev[j] = Math.min(prev[j] + 1, prev[j - 1] + 1, diagonal + (a[i - 1] === b[j - 1] ? 0 : 1));
      diagonal = above;
    }
  }
  return prev[b.length];
}

function closestHeader(name: string, unknown: string[]): string | undefined {
  let best: { header: string; distance: number } | undefined;
  for (const header of unknown) {
    const distance = editDistance(name, header);
    if (distance <= 2 && (!best || distance < best.distance)) best = { header, distance };
  }
  return best?.header;
}

export type ColumnCheck = {
  /** Columns that must be present. */
  required: readonly string[];
  /** Groups of which at least one column must be present, with how to name the group in a message. */
  anyOf?: readonly { columns: readonly string[]; label: string }[];
};

/**
 * Throws when required columns are missing, naming all of them; returns notices for columns the
 * import does not use (they are ignored).
 */
export function checkColumns(
  table: ParsedTable,
  columns: readonly ImportColumn[],
  check: ColumnCheck,
  what: string,
): string[] {
  const present = new Set(table.headers);
  const known = new Set(columns.map((c) => c.name));
  const unknown = table.headers.filter((h) => !known.has(h));
  const missing = check.required.filter((c) => !present.has(c));
  const missingGroups = (check.anyOf ?? []).filter((g) => !g.columns.some((c) => present.has(c)));
  if (missing.length > 0 || missingGroups.length > 0) {
    const parts = [
      ...missing.map((name) => {
        const near = closestHeader(name, unknown);
        return near ? `${name} (is “${near}” meant to be ${name}?)` : name;
      }),
      ...missingGroups.map((g) => g.label),
    ];
    throw new ImportFileError(
      "missing_columns",
      `The ${what} file is missing ${parts.length === 1 ? "a column" : "columns"}: ${parts.join("; ")}. ` +
        "Download the template to see every column.",
      [...missing, ...missingGroups.flatMap((g) => g.columns)],
    );
  }
  return unknown.map((h) => `Column “${h}” is not used by ${what} imports and was ignored.`);
}
