import { SectionTabs } from "@/components/ui/section-tabs";

export function ExportsTabs({ current }: { current: "workbook" | "audit" }) {
  return (
    <SectionTabs
      label="Exports"
      current={current}
      tabs={[
        { key: "workbook", href: "/exports", label: "Register workbook" },
        { key: "audit", href: "/exports/audit", label: "Audit log" },
      ]}
    />
  );
}
