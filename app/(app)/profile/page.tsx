import type { Metadata } from "next";
import Link from "next/link";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePagePermission } from "@/lib/auth/page";
import { can, NAV_ITEMS, ROLE_LABELS } from "@/lib/auth/permissions";
import { findUserById } from "@/db/queries/users";
import { AlertPreferencesForm } from "./alert-preferences-form";

export const metadata: Metadata = { title: "Profile" };

export default async function ProfilePage() {
  const { user } = await requirePagePermission("profile.update");
  const account = findUserById(user.id)!;
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
      <Card title="Alerts by e-mail">
        <p className="mb-4 text-sm text-ink-600">
          Alerts go to the people responsible for a location: the storage unit&apos;s owner, the room&apos;s facilities contact and the safety officers.
        </p>
        <AlertPreferencesForm values={{ alertExcursions: account.alertExcursions, alertFindings: account.alertFindings, dailyDigest: account.dailyDigest }} />
      </Card>
    </div>
  );
}
