import type { Metadata } from "next";
import Link from "next/link";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePagePermission } from "@/lib/auth/page";
import { can, NAV_ITEMS, ROLE_LABELS } from "@/lib/auth/permissions";
import { findUserById } from "@/db/queries/users";
import { listSessions } from "@/lib/auth/session-store";
import { sessionIdleMs, sessionMaxMs } from "@/lib/config";
import { formatDateTime } from "@/lib/format/numbers";
import { describeUserAgent } from "@/lib/format/user-agent";
import { AlertPreferencesForm } from "./alert-preferences-form";
import { SessionList } from "./session-list";

export const metadata: Metadata = { title: "Profile" };

export default async function ProfilePage() {
  const { user } = await requirePagePermission("profile.update");
  const account = findUserById(user.id)!;
  const sessions = listSessions(user.id, user.sessionId).map((s) => ({
    id: s.id,
    device: describeUserAgent(s.userAgent),
    ip: s.ip,
    createdAt: formatDateTime(s.createdAt),
    lastSeenAt: formatDateTime(s.lastSeenAt),
    current: s.current,
  }));
  const idleHours = sessionIdleMs() / 3_600_000;
  const maxDays = sessionMaxMs() / 86_400_000;
  return (
    <div className="space-y-5">
      <PageHeader title="Your profile" />
      <Card title="Account">
        <dl className="grid gap-x-6 gap-y-3 text-sm sm:grid-cols-[10rem_minmax(0,1fr)]">
          <dt className="text-ink-600">Name</dt>
          <dd className="font-medium">{user.name}</dd>
          <dt className="text-ink-600">E-mail address</dt>
          <dd>{user.email}</dd>
          <dt className="text-ink-600">Role</dt>
          <dd>{ROLE_LABELS[user.role]}</dd>
          <dt className="text-ink-600">Areas you can open</dt>
          <dd>{NAV_ITEMS.filter((item) => can(user.role, item.action)).map((item) => item.label).join(", ")}</dd>
        </dl>
        <p className="mt-5 text-sm">
          <Link href="/reset-password" className="text-accent-700 hover:underline">
            Change your password by e-mail link
          </Link>
        </p>
      </Card>
      <Card title={`Where you are signed in (${sessions.length})`}>
        <p className="mb-4 text-sm text-ink-600">
          A session ends when you sign out, after {idleHours % 1 === 0 ? idleHours : idleHours.toFixed(1)} hours without use, {maxDays % 1 === 0 ? maxDays : maxDays.toFixed(1)} days after
          signing in, or when your password changes. End any you do not recognise, then change your password.
        </p>
        <SessionList items={sessions} />
      </Card>
      <Card title="Alerts by e-mail">
        <p className="mb-4 text-sm text-ink-600">
          Alerts go to the people responsible for a location: the storage unit&apos;s owner, the room&apos;s facilities contact and the safety officers.
        </p>
        <AlertPreferencesForm values={{ alertExcursions: account.alertExcursions, alertFindings: account.alertFindings, dailyDigest: account.dailyDigest }} />
      </Card>
      <Card title="For integrators">
        <p className="text-sm text-ink-600">
          Scripts and logger gateways can use Headroom&apos;s JSON API. The{" "}
          <a href="/api-docs" className="text-accent-700 hover:underline">
            API reference
          </a>{" "}
          lists every route with who may call it, what it takes and what it answers; the same description is at{" "}
          <a href="/api/v1/openapi.json" className="text-accent-700 hover:underline">
            /api/v1/openapi.json
          </a>{" "}
          (OpenAPI 3.1).
          {can(user.role, "apiKeys.manage") ? (
            <>
              {" "}
              Keys for gateways are made under{" "}
              <Link href="/admin/api-keys" className="text-accent-700 hover:underline">
                Admin → API keys
              </Link>
              .
            </>
          ) : (
            " Keys for gateways are made by an administrator."
          )}
        </p>
      </Card>
    </div>
  );
}
