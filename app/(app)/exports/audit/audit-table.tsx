"use client";
import { createDataTableColumnHelper, DataTable, type DataTableFilters } from "@/components/data-table";
import { AUDIT_ACTION_LABELS, AUDIT_ENTITY_LABELS, auditActionLabel, auditEntityLabel, type AuditChange } from "@/lib/audit/format";

type AuditRow = {
  id: number;
  at: string;
  actorLabel: string;
  action: string;
  entityType: string;
  entityId: string | null;
  summary: string;
  changes: AuditChange[];
};

const filters: DataTableFilters = {
  search: { label: "Search", placeholder: "Words in the summary, a label, an e-mail" },
  selects: [
    { param: "entityType", label: "Record", allLabel: "All records", options: Object.entries(AUDIT_ENTITY_LABELS).map(([value, label]) => ({ value, label })) },
    {
      param: "action",
      label: "Action",
      allLabel: "All actions",
      options: Object.entries(AUDIT_ACTION_LABELS).map(([value, label]) => ({ value, label })),
    },
  ],
};

const column = createDataTableColumnHelper<AuditRow>();
const columns = column.columns([
  column.accessor("at", {
    id: "at",
    header: "When (UTC)",
    meta: { className: "whitespace-nowrap tabular text-xs" },
    cell: ({ getValue }) => getValue().slice(0, 16).replace("T", " "),
  }),
  column.accessor("actorLabel", { id: "actor", header: "Who", meta: { className: "whitespace-nowrap text-xs", priority: 2 } }),
  column.accessor((row) => `${auditEntityLabel(row.entityType)}${row.entityId ? ` #${row.entityId}` : ""}`, {
    id: "record",
    header: "Record",
    meta: { className: "whitespace-nowrap text-xs" },
  }),
  column.accessor("action", {
    id: "action",
    header: "Action",
    meta: { className: "whitespace-nowrap text-xs" },
    cell: ({ getValue }) => auditActionLabel(getValue()),
  }),
  column.accessor("summary", {
    id: "summary",
    header: "What happened",
    // The event's own words identify it; the columns a narrow table leaves out go under them.
    meta: { className: "min-w-72 font-normal", rowHeader: true },
    cell: ({ row }) => (
      <div>
        <p>{row.original.summary}</p>
        {row.original.changes.length ? (
          <ul className="mt-1 space-y-0.5 text-xs text-ink-600">
            {row.original.changes.map((change) => (
              <li key={change.field} className="[overflow-wrap:anywhere]">
                {change.label}: <span className="line-through">{change.before}</span> → <span className="text-ink-900">{change.after}</span>
              </li>
            ))}
          </ul>
        ) : null}
      </div>
    ),
  }),
]);

const defaultSort = { id: "at", dir: "desc" } as const;
const noun = { one: "event", other: "events" };

export function AuditTable() {
  return (
    <DataTable
      apiUrl="/api/v1/audit-events"
      label="Audit log"
      columns={columns}
      sortable={["at"]}
      defaultSort={defaultSort}
      filters={filters}
      rowKey={(row: AuditRow) => row.id}
      noun={noun}
      emptyMessage="No event matches."
    />
  );
}
