import { SectionTabs } from "@/components/ui/section-tabs";

export function AdminTabs({ current }: { current: "users" | "api-keys" | "mail" }) {
  return (
    <SectionTabs
      label="Administration"
      current={current}
      tabs={[
        { key: "users", href: "/admin", label: "People and roles" },
        { key: "api-keys", href: "/admin/api-keys", label: "API keys" },
        { key: "mail", href: "/admin/mail", label: "E-mail" },
      ]}
    />
  );
}
