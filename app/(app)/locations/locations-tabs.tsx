import Link from "next/link";

export function LocationsTabs({ current }: { current: "rooms" | "units" }) {
  const tab = (key: "rooms" | "units", href: string, label: string) => (
    <Link
      href={href}
      aria-current={current === key ? "page" : undefined}
      className={`border-b-2 px-1 pb-2 text-sm font-medium ${current === key ? "border-accent-700 text-accent-800" : "border-transparent text-ink-600 hover:text-ink-900"}`}
    >
      {label}
    </Link>
  );
  return (
    <nav aria-label="Locations" className="mb-5 flex gap-6 border-b border-ink-200">
      {tab("rooms", "/locations", "Rooms")}
      {tab("units", "/locations/units", "Storage units")}
    </nav>
  );
}
