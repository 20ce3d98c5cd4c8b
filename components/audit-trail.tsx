import type { AuditEvent } from "@/db/schema";
import { formatDateTime } from "@/lib/format/numbers";

function show(value: unknown): string {
  if (value === null || value === undefined || value === "") return "—";
  if (typeof value === "object") return JSON.stringify(value);
  return String(value);
}

/** A record's history: who changed what, when, with the values before and after. */
export function AuditTrail({ events }: { events: AuditEvent[] }) {
  if (events.length === 0) return <p className="text-sm text-ink-600">No changes recorded.</p>;
  return (
    <ol className="space-y-3">
      {events.map((event) => {
        const before = (event.before ?? {}) as Record<string, unknown>;
        const after = (event.after ?? {}) as Record<string, unknown>;
        const keys = event.action === "create" ? [] : Object.keys(after);
        return (
          <li key={event.id} className="text-sm">
            <p className="text-ink-900">{event.summary}</p>
            <p className="tabular text-xs text-ink-500">
              {formatDateTime(event.at)} · {event.actorLabel}
            </p>
            {keys.length ? (
              <table className="mt-1 text-xs">
                <tbody>
                  {keys.map((key) => (
                    <tr key={key}>
                      <th scope="row" className="pr-3 text-left font-normal text-ink-600">{key}</th>
                      <td className="pr-2 text-ink-500 line-through [overflow-wrap:anywhere]">{show(before[key])}</td>
                      <td className="text-ink-900 [overflow-wrap:anywhere]">→ {show(after[key])}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            ) : null}
          </li>
        );
      })}
    </ol>
  );
}
