import { SectionTabs } from "@/components/ui/section-tabs";

export function AdminTabs({ current }: { current: "users" | "mail" }) {
  return (
    <SectionTabs
      label="Administration"
      current={current}
      tabs={[
        { key: "users", href: "/admin", label: "People and roles" },
        { key: "mail", href: "/admin/mail", label: "E-mail" },
      ]}
    />
  );
}
