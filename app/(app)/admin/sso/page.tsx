import type { Metadata } from "next";
import { Card, PageHeader } from "@/components/ui/card";
import { listUsers } from "@/db/queries/users";
import { requirePagePermission } from "@/lib/auth/page";
import { oidcRedirectUri, oidcSettings } from "@/lib/config";
import { SSO_SCOPES } from "@/lib/sso/client";
import { readSsoSettings } from "@/lib/sso/settings";
import { AdminTabs } from "../admin-tabs";
import { SsoSettingsForm } from "./sso-settings-form";

export const metadata: Metadata = { title: "Single sign-on" };

export default async function SsoAdminPage() {
  await requirePagePermission("settings.manage");
  const provider = oidcSettings();
  const value = readSsoSettings();
  const admins = listUsers().filter((p) => p.role === "admin" && p.active && p.signInMethod === "password" && p.hasPassword);
  return (
    <div>
      <PageHeader
        title="Administration"
        description="People can sign in with their institution's account (OpenID Connect). Their groups there decide their role in Headroom."
      />
      <AdminTabs current="sso" />
      <div className="grid gap-6 2xl:grid-cols-[minmax(0,1fr)_380px]">
        <Card title="Rules">
          <SsoSettingsForm value={value} admins={admins} providerConfigured={provider !== null} />
        </Card>
        <Card title="Provider">
          {provider ? (
            <dl className="space-y-3 text-sm">
              <div>
                <dt className="text-ink-600">Status</dt>
                <dd className="font-medium text-ok">● Configured: the sign-in page offers “Sign in with your institution”</dd>
              </div>
              <div>
                <dt className="text-ink-600">Issuer (OIDC_ISSUER)</dt>
                <dd className="break-all font-mono text-xs text-ink-900">{provider.issuer}</dd>
              </div>
              <div>
                <dt className="text-ink-600">Client id (OIDC_CLIENT_ID)</dt>
                <dd className="break-all font-mono text-xs text-ink-900">{provider.clientId}</dd>
              </div>
              <div>
                <dt className="text-ink-600">Redirect URI to register at the provider</dt>
                <dd className="break-all font-mono text-xs text-ink-900">{oidcRedirectUri()}</dd>
              </div>
              <div>
                <dt className="text-ink-600">Scopes asked for</dt>
                <dd className="font-mono text-xs text-ink-900">{SSO_SCOPES}</dd>
                <dd className="mt-1 text-xs text-ink-600">The ID token must carry the person&apos;s groups in a “groups” claim.</dd>
              </div>
            </dl>
          ) : (
            <p className="text-sm text-ink-700">
              Not configured. Set OIDC_ISSUER, OIDC_CLIENT_ID and OIDC_CLIENT_SECRET in the server&apos;s environment and register{" "}
              <code className="break-all font-mono text-xs">{oidcRedirectUri()}</code> as the redirect URI at the provider. The rules on this
              page can be prepared meanwhile.
            </p>
          )}
        </Card>
      </div>
    </div>
  );
}
