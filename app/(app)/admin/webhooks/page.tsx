import { CircleCheck, CirclePause } from "lucide-react";
import type { Metadata } from "next";
import Link from "next/link";
import { priorityCellClass, SecondaryValues, TABLE_CONTAINER_CLASS } from "@/components/data-table/priority";
import { Card, EmptyState, PageHeader } from "@/components/ui/card";
import { WEBHOOK_DELIVERY_STATUSES, type WebhookDeliveryStatus } from "@/db/schema";
import { requirePagePermission } from "@/lib/auth/page";
import { webhookAllowHttpLoopback } from "@/lib/config";
import { formatDateTime } from "@/lib/format/numbers";
import { MAX_ATTEMPTS } from "@/lib/webhooks/deliver";
import { isWebhookEventType, WEBHOOK_EVENT_LABELS } from "@/lib/webhooks/events";
import { receiverRecordings } from "@/lib/webhooks/recorded";
import { listWebhookDeliveries, listWebhookEndpoints } from "@/lib/webhooks/service";
import { AdminTabs } from "../admin-tabs";
import { PauseEndpoint, RetryDelivery, RotateSecret } from "./endpoint-actions";
import { EndpointForm } from "./endpoint-form";

export const metadata: Metadata = { title: "Webhooks" };
export const dynamic = "force-dynamic";

const STATUS_TEXT: Record<WebhookDeliveryStatus, string> = { pending: "◌ Waiting", sending: "◔ Sending", delivered: "● Delivered", failed: "✕ Failed" };
const STATUS_CLASS: Record<WebhookDeliveryStatus, string> = { pending: "text-sev-moderate", sending: "text-sev-moderate", delivered: "text-ok", failed: "text-sev-critical" };

function one(value: string | string[] | undefined): string | undefined {
  return Array.isArray(value) ? value[0] : value;
}

function eventLabel(type: string): string {
  return isWebhookEventType(type) ? WEBHOOK_EVENT_LABELS[type].label : type;
}

export default async function WebhooksPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  await requirePagePermission("webhooks.manage");
  const params = await searchParams;
  const statusParam = one(params.status);
  const status = WEBHOOK_DELIVERY_STATUSES.find((s) => s === statusParam);
  const endpointParam = Number(one(params.endpoint));
  const pageParam = Number(one(params.page));
  const endpoints = listWebhookEndpoints();
  const endpointId = endpoints.some((e) => e.id === endpointParam) ? endpointParam : undefined;
  const deliveries = listWebhookDeliveries({ status, endpointId, page: Number.isInteger(pageParam) && pageParam > 0 ? pageParam : 1 });
  const recordings = await receiverRecordings();
  const httpLoopback = webhookAllowHttpLoopback();

  const href = (change: { status?: string | null; endpoint?: number | null; page?: number }) => {
    const query = new URLSearchParams();
    const s = change.status === undefined ? status : change.status;
    const e = change.endpoint === undefined ? endpointId : change.endpoint;
    if (s) query.set("status", s);
    if (e) query.set("endpoint", String(e));
    if (change.page && change.page > 1) query.set("page", String(change.page));
    const text = query.toString();
    return `/admin/webhooks${text ? `?${text}` : ""}#deliveries`;
  };
  const chip = (active: boolean) =>
    `rounded-full border px-3 py-1 text-xs font-medium ${active ? "border-accent-700 bg-accent-50 text-accent-800" : "border-ink-300 text-ink-700 hover:bg-ink-100"}`;

  return (
    <div>
      <PageHeader
        title="Administration"
        description="Webhooks tell other systems what happens in Headroom — findings raised, escalated and resolved, temperature excursions — as signed HTTP POSTs (Standard Webhooks). A failed delivery is retried for about a day and a half with the same webhook-id; nothing is sent twice once a receiver has answered 2xx."
      />
      <AdminTabs current="webhooks" />
      <div className="space-y-6">
        <div className="grid gap-6 2xl:grid-cols-[minmax(0,1fr)_400px]">
          <Card title={`Endpoints (${endpoints.filter((e) => e.active).length} active${endpoints.some((e) => !e.active) ? `, ${endpoints.filter((e) => !e.active).length} paused` : ""})`}>
            {endpoints.length === 0 ? (
              <EmptyState title="No endpoints yet">Register one for each receiving system, so each can be paused or given a new secret on its own.</EmptyState>
            ) : (
              <ul className="divide-y divide-ink-100">
                {endpoints.map((endpoint) => (
                  <li key={endpoint.id} className="space-y-3 py-4 first:pt-0 last:pb-0">
                    <div className="flex flex-wrap items-start justify-between gap-3">
                      <div className="min-w-0">
                        <p className={`font-medium ${endpoint.active ? "text-ink-900" : "text-ink-600"}`}>{endpoint.description}</p>
                        <p className="break-all font-mono text-xs text-ink-700">{endpoint.url}</p>
                        <p className="mt-1 text-xs text-ink-600">{endpoint.events.map(eventLabel).join(" · ")}</p>
                        <p className="mt-1 text-xs text-ink-600">
                          {endpoint.active ? (
                            <span className="inline-flex items-center gap-1 font-medium text-ok">
                              <CircleCheck aria-hidden="true" className="size-3.5" /> Active
                            </span>
                          ) : (
                            <span className="inline-flex items-center gap-1 font-medium text-ink-700">
                              <CirclePause aria-hidden="true" className="size-3.5" /> Paused: nothing is sent or queued
                            </span>
                          )}
                          {endpoint.allowPrivate ? " · private addresses allowed" : ""} · registered {formatDateTime(endpoint.createdAt)}
                          {endpoint.secretRotatedAt ? ` · secret rotated ${formatDateTime(endpoint.secretRotatedAt)}` : ""}
                        </p>
                        <p className="tabular mt-1 text-xs">
                          <Link className="text-accent-800 underline" href={href({ endpoint: endpoint.id, status: null, page: 1 })}>
                            Deliveries
                          </Link>
                          : {endpoint.counts.delivered ?? 0} delivered · {(endpoint.counts.pending ?? 0) + (endpoint.counts.sending ?? 0)} waiting ·{" "}
                          <span className={endpoint.counts.failed ? "font-medium text-sev-critical" : ""}>{endpoint.counts.failed ?? 0} failed</span>
                        </p>
                      </div>
                      <div className="flex flex-wrap items-start gap-2">
                        <PauseEndpoint id={endpoint.id} name={endpoint.description} active={endpoint.active} />
                        <RotateSecret id={endpoint.id} name={endpoint.description} />
                      </div>
                    </div>
                    <details>
                      <summary className="cursor-pointer text-sm text-accent-800">Change address, events or description</summary>
                      <div className="mt-3 max-w-xl">
                        <EndpointForm existing={{ id: endpoint.id, url: endpoint.url, description: endpoint.description, events: endpoint.events, allowPrivate: endpoint.allowPrivate }} httpLoopback={httpLoopback} />
                      </div>
                    </details>
                  </li>
                ))}
              </ul>
            )}
          </Card>
          <Card title="Register an endpoint">
            <EndpointForm httpLoopback={httpLoopback} />
          </Card>
        </div>

        <div id="deliveries">
          <Card title={`Deliveries (${deliveries.total.toLocaleString("en")})`}>
            <div className="mb-4 flex flex-wrap gap-2" role="group" aria-label="Filter by status">
              <Link className={chip(!status)} href={href({ status: null, page: 1 })}>
                All
              </Link>
              {WEBHOOK_DELIVERY_STATUSES.map((s) => (
                <Link key={s} className={chip(status === s)} href={href({ status: s, page: 1 })} aria-current={status === s ? "true" : undefined}>
                  {STATUS_TEXT[s].slice(2)}
                </Link>
              ))}
              {endpointId ? (
                <Link className={chip(true)} href={href({ endpoint: null, page: 1 })}>
                  Endpoint: {endpoints.find((e) => e.id === endpointId)?.description} ✕
                </Link>
              ) : null}
            </div>
            {deliveries.rows.length === 0 ? (
              <p className="text-sm text-ink-600">No deliveries{status ? ` with this status` : ""} yet.</p>
            ) : (
              <div className={`${TABLE_CONTAINER_CLASS} -mx-4 overflow-x-auto`}>
                <table className="w-full text-sm">
                  <thead>
                    <tr className="border-b border-ink-200 text-left text-xs uppercase tracking-wide text-ink-600">
                      <th scope="col" className="px-4 py-2 font-medium">Event</th>
                      <th scope="col" className={`px-4 py-2 font-medium ${priorityCellClass(2)}`}>Endpoint</th>
                      <th scope="col" className="px-4 py-2 font-medium">Status</th>
                      <th scope="col" className={`px-4 py-2 text-right font-medium ${priorityCellClass(2)}`}>Attempts</th>
                      <th scope="col" className={`px-4 py-2 font-medium ${priorityCellClass(3)}`}>Queued</th>
                    </tr>
                  </thead>
                  <tbody className="tabular">
                    {deliveries.rows.map((d) => (
                      <tr key={d.id} className="border-b border-ink-100 align-top last:border-0">
                        <th scope="row" className="px-4 py-2 text-left font-normal text-ink-900">
                          <details>
                            <summary className="cursor-pointer">
                              {eventLabel(d.eventType)} <code className="font-mono text-xs text-ink-600">{d.messageId}</code>
                            </summary>
                            <div className="mt-2 space-y-2">
                              {d.attemptList.length === 0 ? (
                                <p className="text-xs text-ink-600">Not attempted yet.</p>
                              ) : (
                                <ol className="space-y-1 text-xs">
                                  {d.attemptList.map((a, index) => (
                                    <li key={a.id}>
                                      <span className="font-medium">Attempt {index + 1}</span> · {formatDateTime(a.at)} · {a.durationMs} ms ·{" "}
                                      <span className={a.error ? "text-sev-critical" : "text-ok"}>{a.error ?? `HTTP ${a.statusCode}`}</span>
                                      {a.responseBody ? <pre className="mt-1 max-h-32 overflow-auto whitespace-pre-wrap rounded bg-ink-50 p-2 font-mono text-[11px] text-ink-700">{a.responseBody}</pre> : null}
                                    </li>
                                  ))}
                                </ol>
                              )}
                              <pre className="max-h-64 overflow-auto whitespace-pre-wrap rounded-md bg-ink-50 p-3 font-mono text-xs text-ink-800">{JSON.stringify(JSON.parse(d.payload), null, 2)}</pre>
                            </div>
                          </details>
                          <SecondaryValues
                            items={[
                              { key: "endpoint", label: "Endpoint", value: d.endpointDescription, priority: 2 },
                              { key: "attempts", label: "Attempts", value: d.attempts, priority: 2 },
                              { key: "queued", label: "Queued", value: formatDateTime(d.createdAt), priority: 3 },
                            ]}
                          />
                        </th>
                        <td className={`px-4 py-2 text-ink-700 ${priorityCellClass(2)}`}>{d.endpointDescription}</td>
                        <td className="px-4 py-2">
                          <span className={STATUS_CLASS[d.status]}>{STATUS_TEXT[d.status]}</span>
                          {d.status === "delivered" && d.deliveredAt ? <p className="text-xs text-ink-600">{formatDateTime(d.deliveredAt)}</p> : null}
                          {d.lastError && d.status !== "delivered" ? (
                            <p className="text-xs text-sev-critical">
                              {d.lastError}
                              {d.status === "pending" ? (d.endpointActive ? ` · next try ${formatDateTime(d.nextAttemptAt)}` : " · held while the endpoint is paused") : ""}
                            </p>
                          ) : null}
                          {d.status === "failed" ? <p className="text-xs text-ink-600">Gave up after {MAX_ATTEMPTS} attempts.</p> : null}
                          {d.status === "failed" || (d.status === "pending" && d.attempts > 0) ? (
                            <div className="mt-2">
                              <RetryDelivery id={d.id} />
                            </div>
                          ) : null}
                        </td>
                        <td className={`px-4 py-2 text-right ${priorityCellClass(2)}`}>{d.attempts}</td>
                        <td className={`px-4 py-2 text-xs text-ink-600 ${priorityCellClass(3)}`}>{formatDateTime(d.createdAt)}</td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
            )}
            {deliveries.pageCount > 1 ? (
              <nav aria-label="Pages of deliveries" className="mt-4 flex items-center gap-3 text-sm">
                {deliveries.page > 1 ? (
                  <Link className="text-accent-800 underline" href={href({ page: deliveries.page - 1 })}>
                    ← Newer
                  </Link>
                ) : null}
                <span className="tabular text-ink-600">
                  Page {deliveries.page} of {deliveries.pageCount}
                </span>
                {deliveries.page < deliveries.pageCount ? (
                  <Link className="text-accent-800 underline" href={href({ page: deliveries.page + 1 })}>
                    Older →
                  </Link>
                ) : null}
              </nav>
            ) : null}
          </Card>
        </div>

        {recordings.available || recordings.reason ? (
          <Card title="Recorded by the local webhook receiver">
            {!recordings.available ? (
              <p className="text-sm text-ink-600">{recordings.reason}</p>
            ) : recordings.received.length === 0 ? (
              <EmptyState title="Nothing received yet">The demo&apos;s receiver at {recordings.url} records what it is sent and checks each signature.</EmptyState>
            ) : (
              <ul className="divide-y divide-ink-100">
                {recordings.received.map((r) => (
                  <li key={r.id} className="py-3">
                    <details>
                      <summary className="cursor-pointer list-none">
                        <span className="font-medium text-ink-900">{r.eventType ? eventLabel(r.eventType) : "(not JSON)"}</span>{" "}
                        <span className={r.signatureValid === true ? "text-ok" : r.signatureValid === false ? "text-sev-critical" : "text-ink-600"}>
                          {r.signatureValid === true ? "✓ signature valid" : r.signatureValid === false ? `✕ signature invalid (${r.verifyError})` : "signature not checked (no secret)"}
                        </span>
                        <span className="tabular block text-xs text-ink-600">
                          {r.webhookId} · {formatDateTime(new Date(r.receivedAt))} · answered {r.answeredStatus}
                        </span>
                      </summary>
                      <pre className="mt-3 max-h-64 overflow-auto whitespace-pre-wrap rounded-md bg-ink-50 p-3 font-mono text-xs text-ink-800">{r.body}</pre>
                    </details>
                  </li>
                ))}
              </ul>
            )}
          </Card>
        ) : null}
      </div>
    </div>
  );
}
