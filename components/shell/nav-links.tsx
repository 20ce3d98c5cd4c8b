"use client";
import {
  Atom,
  ClipboardList,
  FileSpreadsheet,
  FlaskConical,
  LayoutDashboard,
  LoaderCircle,
  Settings,
  Thermometer,
  Warehouse,
  type LucideIcon,
} from "lucide-react";
import Link, { useLinkStatus } from "next/link";
import { usePathname } from "next/navigation";
import type { NavItem } from "@/lib/auth/permissions";

const ICONS: Record<string, LucideIcon> = {
  "/": LayoutDashboard,
  "/register": ClipboardList,
  "/inventory": FlaskConical,
  "/locations": Warehouse,
  "/temperatures": Thermometer,
  "/substances": Atom,
  "/exports": FileSpreadsheet,
  "/admin": Settings,
};

/**
 * Pages render whole on the server before they are sent (so a page a role may not open answers
 * 403, not a 200 with the refusal streamed into it); meanwhile the link that was followed spins.
 */
function PendingMark() {
  const { pending } = useLinkStatus();
  if (!pending) return null;
  return (
    <span role="status" className="ml-auto">
      <LoaderCircle aria-hidden="true" className="size-4 animate-spin" />
      <span className="sr-only">Loading…</span>
    </span>
  );
}

function isActive(pathname: string, href: string): boolean {
  return href === "/" ? pathname === "/" : pathname === href || pathname.startsWith(`${href}/`);
}

export function NavLinks({ items, onNavigate }: { items: NavItem[]; onNavigate?: () => void }) {
  const pathname = usePathname();
  return (
    <ul className="space-y-0.5">
      {items.map((item) => {
        const Icon = ICONS[item.href] ?? LayoutDashboard;
        const active = isActive(pathname, item.href);
        return (
          <li key={item.href}>
            <Link
              href={item.href}
              onClick={onNavigate}
              aria-current={active ? "page" : undefined}
              className={`flex items-center gap-2.5 rounded-md px-2.5 py-2 text-sm font-medium transition-colors ${
                active ? "bg-accent-700 text-white" : "text-accent-100 hover:bg-accent-800 hover:text-white"
              }`}
            >
              <Icon aria-hidden="true" className="size-4 shrink-0" strokeWidth={2} />
              {item.label}
              <PendingMark />
            </Link>
          </li>
        );
      })}
    </ul>
  );
}
