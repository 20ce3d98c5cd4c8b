import { Ban, CircleCheck } from "lucide-react";
import type { Metadata } from "next";
import { priorityCellClass, SecondaryValues, TABLE_CONTAINER_CLASS } from "@/components/data-table/priority";
import { Card, EmptyState, PageHeader } from "@/components/ui/card";
import { requirePagePermission } from "@/lib/auth/page";
import { listApiKeys } from "@/lib/api-keys/service";
import { API_KEY_SCOPE_LABELS, type ApiKeyScope } from "@/lib/api-keys/scopes";
import { formatDateTime } from "@/lib/format/numbers";
import { AdminTabs } from "../admin-tabs";
import { ApiKeyCreateForm } from "./api-key-create-form";
import { RevokeApiKey } from "./revoke-api-key";

export const metadata: Metadata = { title: "API keys" };

export default async function ApiKeysPage() {
  await requirePagePermission("apiKeys.manage");
  const keys = listApiKeys();
  const live = keys.filter((k) => !k.revokedAt).length;
  return (
    <div>
      <PageHeader
        title="Administration"
        description="API keys let temperature loggers and gateways send readings without a person signing in. A key is shown once when it is created; Headroom stores only its hash."
      />
      <AdminTabs current="api-keys" />
      <div className="grid gap-6 2xl:grid-cols-[minmax(0,1fr)_360px]">
        <Card title={`API keys (${live} in use${keys.length > live ? `, ${keys.length - live} revoked` : ""})`}>
          {keys.length === 0 ? (
            <EmptyState title="No API keys yet">Create one for each logger gateway, so each can be revoked on its own.</EmptyState>
          ) : (
            <div className={`${TABLE_CONTAINER_CLASS} -mx-4 -my-4 overflow-x-auto`}>
              <table className="w-full text-sm">
                <thead className="bg-ink-50">
                  <tr className="border-b border-ink-200 text-left text-xs uppercase tracking-wide text-ink-600">
                    <th scope="col" className="px-4 py-2 font-medium">Name</th>
                    <th scope="col" className="px-4 py-2 font-medium">Scopes</th>
                    <th scope="col" className={`px-4 py-2 font-medium ${priorityCellClass(2)}`}>Created</th>
                    <th scope="col" className={`px-4 py-2 font-medium ${priorityCellClass(2)}`}>Last used</th>
                    <th scope="col" className="px-4 py-2 font-medium">Status</th>
                  </tr>
                </thead>
                <tbody className="tabular">
                  {keys.map((key) => (
                    <tr key={key.id} className={`border-b border-ink-100 align-top last:border-0 ${key.revokedAt ? "text-ink-500" : ""}`}>
                      <th scope="row" className="px-4 py-3 text-left font-normal">
                        <p className={`font-medium ${key.revokedAt ? "text-ink-600 line-through" : "text-ink-900"}`}>{key.name}</p>
                        <p className="font-mono text-xs text-ink-600">{key.prefix}…</p>
                        <SecondaryValues
                          items={[
                            { key: "created", label: "Created", value: formatDateTime(key.createdAt), priority: 2 },
                            { key: "used", label: "Last used", value: key.lastUsedAt ? formatDateTime(key.lastUsedAt) : "never", priority: 2 },
                          ]}
                        />
                      </th>
                      <td className="px-4 py-3 text-xs">
                        {key.scopes.map((scope) => (
                          <span key={scope} className="block">
                            {API_KEY_SCOPE_LABELS[scope as ApiKeyScope]?.label ?? scope} <code className="font-mono text-ink-600">{scope}</code>
                          </span>
                        ))}
                      </td>
                      <td className={`whitespace-nowrap px-4 py-3 text-xs ${priorityCellClass(2)}`}>{formatDateTime(key.createdAt)}</td>
                      <td className={`whitespace-nowrap px-4 py-3 text-xs ${priorityCellClass(2)}`}>{key.lastUsedAt ? formatDateTime(key.lastUsedAt) : "never"}</td>
                      <td className="px-4 py-3 text-xs">
                        {key.revokedAt ? (
                          <span className="inline-flex items-center gap-1 font-medium text-ink-700">
                            <Ban aria-hidden="true" className="size-3.5" /> Revoked {formatDateTime(key.revokedAt)}
                          </span>
                        ) : (
                          <div className="space-y-2">
                            <span className="inline-flex items-center gap-1 font-medium text-ok">
                              <CircleCheck aria-hidden="true" className="size-3.5" /> In use
                            </span>
                            <RevokeApiKey id={key.id} name={key.name} />
                          </div>
                        )}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
        </Card>
        <Card title="Create a key">
          <ApiKeyCreateForm />
        </Card>
      </div>
    </div>
  );
}
