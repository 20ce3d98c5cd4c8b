/**
 * The one permission matrix. Every page, server action and route handler asks it; nothing else
 * decides who may do what. A cell is "all" (any record), "own" (records the user owns or is
 * responsible for — the query itself enforces which), or absent (not allowed).
 *
 * Pure: no database, no Next.js, so it is unit-tested cell by cell.
 */
import { ROLES, type Role } from "./roles";

export { ROLES, type Role };

export type Scope = "all" | "own";

type Row = Partial<Record<Role, Scope>>;

const everyone: Row = { admin: "all", safety_officer: "all", researcher: "all", facilities: "all", auditor: "all" };
const adminOnly: Row = { admin: "all" };
const safety: Row = { admin: "all", safety_officer: "all" };
const locationsStaff: Row = { admin: "all", safety_officer: "all", facilities: "all" };
const readers: Row = { admin: "all", safety_officer: "all", auditor: "all" };

export const PERMISSIONS = {
  "overview.read": everyone,
  "profile.update": everyone,
  // One's own sessions: list them, end one, sign out everywhere else.
  "sessions.own": everyone,

  "users.manage": adminOnly,
  "users.endSessions": adminOnly,
  "apiKeys.manage": adminOnly,
  "settings.manage": adminOnly,
  "mail.view": adminOnly,
  // Webhooks: register endpoints, rotate secrets, see and retry deliveries.
  "webhooks.manage": adminOnly,

  "locations.read": everyone,
  "locations.write": locationsStaff,
  "locations.import": locationsStaff,

  "temperatures.read": { ...locationsStaff, auditor: "all" },
  "sensors.write": locationsStaff,
  "readings.upload": locationsStaff,
  "excursions.acknowledge": locationsStaff,

  "substances.read": everyone,
  "substances.write": safety,

  "inventory.read": everyone,
  "containers.write": { ...safety, researcher: "own" },
  "containers.import": safety,
  "mixtures.write": { ...safety, researcher: "all" },
  "files.upload": { ...safety, researcher: "own" },

  "hazardSettings.write": safety,

  "findings.read": { ...readers, researcher: "own", facilities: "own" },
  "findings.acknowledge": { ...safety, researcher: "own", facilities: "own" },
  "findings.comment": { ...safety, researcher: "own", facilities: "own" },
  "findings.work": safety,
  // Accepting a risk is a safety officer's professional judgement, not an administrator's.
  "findings.acceptRisk": { safety_officer: "all" },
  "assessments.preview": { ...safety, researcher: "all", facilities: "all" },

  "exports.download": readers,
  "audit.read": readers,
} as const satisfies Record<string, Row>;

export type Action = keyof typeof PERMISSIONS;

export const ACTIONS = Object.keys(PERMISSIONS) as Action[];

/** The scope a role has for an action, or null when the role may not do it at all. */
export function scopeFor(role: Role, action: Action): Scope | null {
  const row: Row = PERMISSIONS[action];
  return row[role] ?? null;
}

export function can(role: Role, action: Action): boolean {
  return scopeFor(role, action) !== null;
}

export const ROLE_LABELS: Record<Role, string> = {
  admin: "Administrator",
  safety_officer: "Safety officer",
  researcher: "Researcher",
  facilities: "Facilities",
  auditor: "Auditor",
};

export type NavItem = { href: string; label: string; action: Action };

/** The signed-in shell's navigation; each item shows only to roles allowed its action. */
export const NAV_ITEMS: readonly NavItem[] = [
  { href: "/", label: "Overview", action: "overview.read" },
  { href: "/register", label: "Register", action: "findings.read" },
  { href: "/inventory", label: "Inventory", action: "inventory.read" },
  { href: "/locations", label: "Locations", action: "locations.read" },
  { href: "/temperatures", label: "Temperatures", action: "temperatures.read" },
  { href: "/substances", label: "Substances", action: "substances.read" },
  { href: "/exports", label: "Exports", action: "exports.download" },
  { href: "/admin", label: "Admin", action: "users.manage" },
];

export function navigationFor(role: Role): NavItem[] {
  return NAV_ITEMS.filter((item) => can(role, item.action));
}
