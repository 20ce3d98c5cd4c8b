"use client";
import { LogOut, Menu, X } from "lucide-react";
import Link from "next/link";
import { useState } from "react";
import type { NavItem } from "@/lib/auth/permissions";
import { Logo } from "./logo";
import { NavLinks } from "./nav-links";

type ShellUser = { name: string; email: string; roleLabel: string };

function UserBlock({ user, signOut }: { user: ShellUser; signOut: () => Promise<void> }) {
  return (
    <div className="border-t border-accent-800 pt-4">
      <Link href="/profile" className="block rounded-md px-2.5 py-1.5 hover:bg-accent-800">
        <span className="block truncate text-sm font-medium text-white">{user.name}</span>
        <span className="block truncate text-xs text-accent-200">{user.roleLabel}</span>
      </Link>
      <form action={signOut} className="mt-2">
        <button
          type="submit"
          className="flex w-full items-center gap-2.5 rounded-md px-2.5 py-2 text-sm font-medium text-accent-100 hover:bg-accent-800 hover:text-white"
        >
          <LogOut aria-hidden="true" className="size-4" />
          Sign out
        </button>
      </form>
    </div>
  );
}

/** The signed-in frame: a sidebar on desktop, a top bar with a menu on tablets and phones. */
export function AppShell({
  user,
  items,
  signOut,
  children,
}: {
  user: ShellUser;
  items: NavItem[];
  signOut: () => Promise<void>;
  children: React.ReactNode;
}) {
  const [open, setOpen] = useState(false);
  return (
    <div className="min-h-screen lg:grid lg:grid-cols-[232px_minmax(0,1fr)]">
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:rounded focus:bg-white focus:px-3 focus:py-2">
        Skip to content
      </a>
      {/* The aside stretches down the whole grid row, so its colour reaches the bottom of the longest
          page; its contents stay in view (sticky) and scroll on their own in a short window. */}
      <aside className="no-print hidden bg-accent-900 lg:block">
        <div className="lg:sticky lg:top-0 lg:flex lg:h-screen lg:flex-col lg:justify-between lg:gap-6 lg:overflow-y-auto lg:px-3 lg:py-5">
          <div>
            <div className="px-2.5 pb-6">
              <Logo inverted />
            </div>
            <nav aria-label="Main">
              <NavLinks items={items} />
            </nav>
          </div>
          <UserBlock user={user} signOut={signOut} />
        </div>
      </aside>

      <header className="no-print sticky top-0 z-30 flex h-14 items-center justify-between bg-accent-900 px-4 lg:hidden">
        <Logo inverted />
        <button
          type="button"
          onClick={() => setOpen((value) => !value)}
          aria-expanded={open}
          aria-controls="mobile-nav"
          className="rounded-md p-2 text-white hover:bg-accent-800"
        >
          {open ? <X aria-hidden="true" className="size-5" /> : <Menu aria-hidden="true" className="size-5" />}
          <span className="sr-only">{open ? "Close menu" : "Open menu"}</span>
        </button>
      </header>
      {open ? (
        <div id="mobile-nav" className="no-print fixed inset-x-0 top-14 bottom-0 z-20 flex flex-col justify-between gap-4 overflow-y-auto overscroll-contain bg-accent-900 px-3 pt-2 pb-4 shadow-lg lg:hidden">
          <nav aria-label="Main">
            <NavLinks items={items} onNavigate={() => setOpen(false)} />
          </nav>
          <UserBlock user={user} signOut={signOut} />
        </div>
      ) : null}

      <main id="main" className="min-w-0 px-4 py-6 sm:px-6 lg:px-10 lg:py-8">
        <div className="mx-auto max-w-7xl">{children}</div>
      </main>
    </div>
  );
}
