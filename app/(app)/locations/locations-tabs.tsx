import { SectionTabs } from "@/components/ui/section-tabs";

export function LocationsTabs({ current }: { current: "rooms" | "units" }) {
  return (
    <SectionTabs
      label="Locations"
      current={current}
      tabs={[
        { key: "rooms", href: "/locations", label: "Rooms" },
        { key: "units", href: "/locations/units", label: "Storage units" },
      ]}
    />
  );
}
