"use client";
import { createDataTableColumnHelper, DataTable, type DataTableFilters } from "@/components/data-table";

type AuditRow = {
  id: number;
  at: string;
  actorLabel: string;
  action: string;
  entityType: string;
  entityId: string | null;
  summary: string;
  before: Record<string, unknown> | null;
  after: Record<string, unknown> | null;
};

const RECORD_LABELS: Record<string, string> = {
  container: "Container",
  room: "Room",
  storage_unit: "Storage unit",
  site: "Site",
  substance: "Substance",
  mixture: "Mixture",
  user: "Person",
  installation: "Installation",
};

const filters: DataTableFilters = {
  search: { label: "Search", placeholder: "Words in the summary, a label, an e-mail" },
  selects: [
    { param: "entityType", label: "Record", allLabel: "All records", options: Object.entries(RECORD_LABELS).map(([value, label]) => ({ value, label })) },
    {
      param: "action",
      label: "Action",
      allLabel: "All actions",
      options: ["create", "update", "move", "retire", "restore", "import", "invite", "change_role", "deactivate", "sign_in"].map((a) => ({ value: a, label: a.replace("_", " ") })),
    },
  ],
};

function show(value: unknown): string {
  if (value === null || value === undefined || value === "") return "—";
  return typeof value === "object" ? JSON.stringify(value) : String(value);
}

const column = createDataTableColumnHelper<AuditRow>();
const columns = column.columns([
  column.accessor("at", {
    id: "at",
    header: "When (UTC)",
    meta: { className: "whitespace-nowrap tabular text-xs" },
    cell: ({ getValue }) => getValue().slice(0, 19).replace("T", " "),
  }),
  column.accessor("actorLabel", { id: "actor", header: "Who", meta: { className: "whitespace-nowrap text-xs" } }),
  column.accessor((row) => `${RECORD_LABELS[row.entityType] ?? row.entityType}${row.entityId ? ` #${row.entityId}` : ""}`, {
    id: "record",
    header: "Record",
    meta: { className: "whitespace-nowrap text-xs" },
  }),
  column.accessor("summary", {
    id: "summary",
    header: "What happened",
    meta: { className: "min-w-72" },
    cell: ({ row }) => {
      const after = row.original.after ?? {};
      const before = row.original.before ?? {};
      const keys = row.original.action === "create" || row.original.action === "import" ? [] : Object.keys(after);
      return (
        <div>
          <p>{row.original.summary}</p>
          {keys.length ? (
            <ul className="mt-1 space-y-0.5 text-xs text-ink-600">
              {keys.map((key) => (
                <li key={key} className="[overflow-wrap:anywhere]">
                  {key}: <span className="line-through">{show(before[key])}</span> → <span className="text-ink-900">{show(after[key])}</span>
                </li>
              ))}
            </ul>
          ) : null}
        </div>
      );
    },
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
