import type { AuditEvent } from "@/db/schema";
import type { AuditChange } from "@/lib/audit/format";
import { formatDateTime } from "@/lib/format/numbers";

/** A record's history: who changed what, when, with the changed fields' values before and after, in words. */
export function AuditTrail({ events }: { events: (AuditEvent & { changes: AuditChange[] })[] }) {
  if (events.length === 0) return <p className="text-sm text-ink-600">No changes recorded.</p>;
  return (
    <ol className="space-y-3">
      {events.map((event) => (
        <li key={event.id} className="text-sm">
          <p className="text-ink-900">{event.summary}</p>
          <p className="tabular text-xs text-ink-500">
            {formatDateTime(event.at)} · {event.actorLabel}
          </p>
          {event.changes.length ? (
            <table className="mt-1 text-xs">
              <tbody>
                {event.changes.map((change) => (
                  <tr key={change.field}>
                    <th scope="row" className="pr-3 text-left font-normal text-ink-600">
                      {change.label}
                    </th>
                    <td className="pr-2 text-ink-500 [overflow-wrap:anywhere]">
                      <span className="sr-only">from </span>
                      <span className="line-through">{change.before}</span>
                    </td>
                    <td className="text-ink-900 [overflow-wrap:anywhere]">
                      <span aria-hidden="true">→ </span>
                      <span className="sr-only">to </span>
                      {change.after}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          ) : null}
        </li>
      ))}
    </ol>
  );
}
