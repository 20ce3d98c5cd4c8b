import { SectionTabs } from "@/components/ui/section-tabs";

export function AdminTabs({ current }: { current: "users" | "api-keys" | "mail" | "sso" | "webhooks" }) {
  return (
    <SectionTabs
      label="Administration"
      current={current}
      tabs={[
        { key: "users", href: "/admin", label: "People and roles" },
        { key: "api-keys", href: "/admin/api-keys", label: "API keys" },
        { key: "mail", href: "/admin/mail", label: "E-mail" },
        // Single sign-on
        { key: "sso", href: "/admin/sso", label: "Single sign-on" },
        // Webhooks: signed deliveries to receivers admins register.
        { key: "webhooks", href: "/admin/webhooks", label: "Webhooks" },
      ]}
    />
  );
}
