/**
 * The demo organisation's single sign-on: group rules for the local provider's invented groups and
 * one person invited to sign in with the institution (Ines Calloway, a researcher). The local
 * provider's people are in lib/sso/fake-provider.ts.
 */
import type { DbOrTx } from "@/db/client";
import { settings, users, type User } from "@/db/schema";
import { recordAudit } from "@/lib/audit/record";
import type { SsoSettings } from "@/lib/sso/schemas";

export const DEMO_SSO_SETTINGS: SsoSettings = {
  mappings: [
    { group: "chem-safety-office", role: "safety_officer" },
    { group: "estates-team", role: "facilities" },
    { group: "audit-panel", role: "auditor" },
    { group: "research-staff", role: "researcher" },
  ],
  jitDomains: [],
  requireSso: false,
  breakGlassUserId: null,
};

export const DEMO_SSO_INVITEE = { email: "ines.calloway@example.org", name: "Ines Calloway", role: "researcher" as const };

export function seedDemoSso(tx: DbOrTx, admin: User): void {
  tx.insert(settings).values({ key: "sso", value: DEMO_SSO_SETTINGS, updatedById: admin.id }).onConflictDoNothing().run();
  const invitee = tx
    .insert(users)
    .values({ ...DEMO_SSO_INVITEE, signInMethod: "sso", invitedById: admin.id })
    .onConflictDoNothing()
    .returning()
    .get();
  if (!invitee) return;
  recordAudit(tx, { system: "demo seed" }, {
    action: "invite",
    entityType: "user",
    entityId: invitee.id,
    summary: `Invited ${invitee.email} as Researcher to sign in with the institution`,
    after: { email: invitee.email, name: invitee.name, role: invitee.role, signInMethod: "sso" },
  });
}
