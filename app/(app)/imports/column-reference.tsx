import { priorityCellClass, SecondaryValues, TABLE_CONTAINER_CLASS } from "@/components/data-table/priority";
import type { ImportColumn } from "@/lib/imports";

function accepted(column: ImportColumn): string {
  if (column.type === "choice") return (column.choices ?? []).join(", ");
  if (column.type === "yes_no") return "yes or no";
  if (column.type === "date") return "YYYY-MM-DD, or a date cell";
  if (column.type === "number") return "a number, with a dot as the decimal mark";
  if (column.type === "email") return "an e-mail address";
  return "text";
}

/** Every column a file may have, with what it means and what it accepts. */
export function ColumnReference({ columns, caption }: { columns: readonly ImportColumn[]; caption: string }) {
  return (
    <div className={`${TABLE_CONTAINER_CLASS} -mx-4 -my-4 overflow-x-auto`}>
      <table className="w-full text-sm">
        <caption className="sr-only">{caption}</caption>
        <thead>
          <tr className="border-b border-ink-200 text-left text-xs uppercase tracking-wide text-ink-600">
            <th scope="col" className="px-4 py-2 font-medium">Column</th>
            <th scope="col" className="px-4 py-2 font-medium">Required</th>
            <th scope="col" className="px-4 py-2 font-medium">Meaning</th>
            <th scope="col" className={`px-4 py-2 font-medium ${priorityCellClass(2)}`}>Accepts</th>
            <th scope="col" className={`px-4 py-2 font-medium ${priorityCellClass(2)}`}>Example</th>
          </tr>
        </thead>
        <tbody>
          {columns.map((column) => (
            <tr key={column.name} className="border-b border-ink-100 align-top last:border-0">
              <th scope="row" className="px-4 py-2 text-left font-mono text-xs font-normal text-ink-900">{column.name}</th>
              <td className="px-4 py-2">{column.required ? "Yes" : "No"}</td>
              <td className="px-4 py-2 text-ink-700">
                {column.description}
                {/* A narrow table leaves out what the column accepts and its example: they go under the meaning. */}
                <SecondaryValues
                  items={[
                    { key: "accepts", label: "Accepts", value: accepted(column), priority: 2 },
                    { key: "example", label: "Example", value: <span className="font-mono">{column.example || "—"}</span>, priority: 2 },
                  ]}
                />
              </td>
              <td className={`px-4 py-2 text-xs text-ink-700 ${priorityCellClass(2)}`}>{accepted(column)}</td>
              <td className={`px-4 py-2 font-mono text-xs ${priorityCellClass(2)}`}>{column.example || "—"}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

/** Links to the CSV and XLSX templates of one kind. */
export function TemplateLinks({ kind }: { kind: "containers" | "locations" }) {
  const link = "font-medium text-accent-700 underline hover:text-accent-800";
  return (
    <p className="text-sm text-ink-700">
      Start from a template:{" "}
      <a href={`/api/v1/imports/templates/${kind}.xlsx`} download className={link}>
        workbook (XLSX)
      </a>{" "}
      with a sheet explaining every column, or{" "}
      <a href={`/api/v1/imports/templates/${kind}.csv`} download className={link}>
        CSV
      </a>
      . The example rows are invented; replace them with your own.
    </p>
  );
}
