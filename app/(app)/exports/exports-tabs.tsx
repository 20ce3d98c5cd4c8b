import Link from "next/link";

export function ExportsTabs({ current }: { current: "workbook" | "audit" }) {
  const tab = (key: "workbook" | "audit", href: string, label: string) => (
    <Link
      href={href}
      aria-current={current === key ? "page" : undefined}
      className={`border-b-2 px-1 pb-2 text-sm font-medium ${current === key ? "border-accent-700 text-accent-800" : "border-transparent text-ink-600 hover:text-ink-900"}`}
    >
      {label}
    </Link>
  );
  return (
    <nav aria-label="Exports" className="mb-6 flex gap-6 border-b border-ink-200">
      {tab("workbook", "/exports", "Register workbook")}
      {tab("audit", "/exports/audit", "Audit log")}
    </nav>
  );
}
