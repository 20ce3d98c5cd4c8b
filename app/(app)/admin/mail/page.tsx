import type { Metadata } from "next";
import { priorityCellClass, SecondaryValues, TABLE_CONTAINER_CLASS } from "@/components/data-table/priority";
import { Card, EmptyState, PageHeader } from "@/components/ui/card";
import { recentOutbox } from "@/db/queries/mail";
import { requirePagePermission } from "@/lib/auth/page";
import { mailBaseUrl, mailUsesFake } from "@/lib/config";
import { formatDateTime } from "@/lib/format/numbers";
import { capturedMessages } from "@/lib/mail/captured";
import { AdminTabs } from "../admin-tabs";

export const metadata: Metadata = { title: "E-mail" };
export const dynamic = "force-dynamic";

const STATUS_TEXT = { queued: "◌ Queued", sending: "◔ Sending", sent: "● Sent" } as const;

export default async function MailPage() {
  await requirePagePermission("mail.view");
  const outbox = recentOutbox();
  const mailbox = await capturedMessages();
  return (
    <div>
      <PageHeader
        title="Administration"
        description={
          mailUsesFake()
            ? `E-mail goes to the local e-mail fake at ${mailBaseUrl()}, which captures every message instead of delivering it.`
            : `E-mail goes to the hosted e-mail service at ${mailBaseUrl()}.`
        }
      />
      <AdminTabs current="mail" />
      <div className="space-y-6">
        <Card title="Outbox (latest 50)">
          {outbox.length === 0 ? (
            <p className="text-sm text-ink-600">No messages yet.</p>
          ) : (
            <div className={`${TABLE_CONTAINER_CLASS} -mx-4 -my-4 overflow-x-auto`}>
              <table className="w-full text-sm">
                <thead>
                  <tr className="border-b border-ink-200 text-left text-xs uppercase tracking-wide text-ink-600">
                    <th scope="col" className="px-4 py-2 font-medium">Subject</th>
                    <th scope="col" className="px-4 py-2 font-medium">To</th>
                    <th scope="col" className="px-4 py-2 font-medium">Status</th>
                    <th scope="col" className={`px-4 py-2 text-right font-medium ${priorityCellClass(2)}`}>Attempts</th>
                    <th scope="col" className={`px-4 py-2 font-medium ${priorityCellClass(2)}`}>Queued</th>
                  </tr>
                </thead>
                <tbody className="tabular">
                  {outbox.map((m) => (
                    <tr key={m.id} className="border-b border-ink-100 align-top last:border-0">
                      <th scope="row" className="px-4 py-2 text-left font-normal text-ink-900">
                        {m.subject}
                        <SecondaryValues
                          items={[
                            { key: "attempts", label: "Attempts", value: m.attempts, priority: 2 },
                            { key: "queued", label: "Queued", value: formatDateTime(m.createdAt), priority: 2 },
                          ]}
                        />
                      </th>
                      <td className="px-4 py-2 text-ink-700">{m.toAddresses.join(", ")}</td>
                      <td className="px-4 py-2">
                        <span className={m.status === "sent" ? "text-ok" : "text-sev-moderate"}>{STATUS_TEXT[m.status]}</span>
                        {m.lastError && m.status !== "sent" ? (
                          <p className="text-xs text-sev-critical">
                            {m.lastError} · next try {formatDateTime(m.nextAttemptAt)}
                          </p>
                        ) : null}
                      </td>
                      <td className={`px-4 py-2 text-right ${priorityCellClass(2)}`}>{m.attempts}</td>
                      <td className={`px-4 py-2 text-xs text-ink-600 ${priorityCellClass(2)}`}>{formatDateTime(m.createdAt)}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
        </Card>

        <Card title="Captured by the e-mail fake">
          {!mailbox.available ? (
            <p className="text-sm text-ink-600">{mailbox.reason}</p>
          ) : mailbox.messages.length === 0 ? (
            <EmptyState title="The mailbox is empty" />
          ) : (
            <ul className="divide-y divide-ink-100">
              {mailbox.messages.slice(0, 100).map((message) => (
                <li key={message.id} className="py-3">
                  <details>
                    <summary className="cursor-pointer list-none">
                      <span className="font-medium text-ink-900">{message.subject}</span>
                      <span className="tabular block text-xs text-ink-600">
                        to {message.to.join(", ")} · {formatDateTime(new Date(message.created_at))}
                      </span>
                    </summary>
                    <pre className="mt-3 whitespace-pre-wrap rounded-md bg-ink-50 p-3 font-mono text-xs text-ink-800">{message.text ?? "(HTML only)"}</pre>
                  </details>
                </li>
              ))}
            </ul>
          )}
        </Card>
      </div>
    </div>
  );
}
