import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { settings } from "@/db/schema";
import { recordAudit } from "@/lib/audit/record";
import type { Role } from "@/lib/auth/roles";
import type { SessionUser } from "@/lib/auth/session";

export const REGISTER_VIEWS_SETTING = "registerDefaultViews";

/**
 * What each role sees first when it opens the register, until a safety officer saves another
 * view: the findings that still need work, most severe first; auditors see every status.
 */
export const BUILT_IN_VIEWS: Record<Role, string> = {
  admin: "status=open,acknowledged,mitigating&sort=severity&dir=desc",
  safety_officer: "status=open,acknowledged,mitigating&sort=severity&dir=desc",
  researcher: "status=open,acknowledged,mitigating&sort=severity&dir=desc",
  facilities: "status=open,acknowledged,mitigating&sort=severity&dir=desc",
  auditor: "status=all&sort=severity&dir=desc",
};

function savedViews(): Partial<Record<Role, string>> {
  const row = getDb().select({ value: settings.value }).from(settings).where(eq(settings.key, REGISTER_VIEWS_SETTING)).get();
  return row && typeof row.value === "object" && row.value ? (row.value as Partial<Record<Role, string>>) : {};
}

export function defaultRegisterView(role: Role): { query: string; saved: boolean } {
  const saved = savedViews()[role];
  return saved ? { query: saved, saved: true } : { query: BUILT_IN_VIEWS[role], saved: false };
}

export function saveRegisterView(actor: SessionUser, role: Role, query: string): void {
  getDb().transaction((tx) => {
    const before = tx.select({ value: settings.value }).from(settings).where(eq(settings.key, REGISTER_VIEWS_SETTING)).get();
    const views = { ...((before?.value as Partial<Record<Role, string>> | undefined) ?? {}), [role]: query };
    tx.insert(settings)
      .values({ key: REGISTER_VIEWS_SETTING, value: views, updatedById: actor.id })
      .onConflictDoUpdate({ target: settings.key, set: { value: views, updatedById: actor.id, updatedAt: new Date() } })
      .run();
    recordAudit(tx, actor, { action: "update", entityType: "setting", entityId: REGISTER_VIEWS_SETTING, summary: `Default register view for ${role}: ${query}`, before: before?.value ?? null, after: views });
  });
}
