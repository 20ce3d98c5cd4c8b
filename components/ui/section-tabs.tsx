import Link from "next/link";

/** The tabs under an area's header: links, with the current one marked for screen readers too. */
export function SectionTabs<K extends string>({ label, current, tabs }: { label: string; current: K; tabs: { key: K; href: string; label: string }[] }) {
  return (
    <nav aria-label={label} className="mb-6 flex gap-6 border-b border-ink-200">
      {tabs.map((tab) => (
        <Link
          key={tab.key}
          href={tab.href}
          aria-current={current === tab.key ? "page" : undefined}
          className={`border-b-2 px-1 pb-2 text-sm font-medium ${current === tab.key ? "border-accent-700 text-accent-800" : "border-transparent text-ink-600 hover:text-ink-900"}`}
        >
          {tab.label}
        </Link>
      ))}
    </nav>
  );
}
