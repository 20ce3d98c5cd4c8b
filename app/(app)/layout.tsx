import { AppShell } from "@/components/shell/app-shell";
import { requirePageUser } from "@/lib/auth/page";
import { navigationFor, ROLE_LABELS } from "@/lib/auth/permissions";
import { signOutAction } from "../(auth)/actions";

export default async function SignedInLayout({ children }: { children: React.ReactNode }) {
  const user = await requirePageUser();
  return (
    <AppShell
      user={{ name: user.name, email: user.email, roleLabel: ROLE_LABELS[user.role] }}
      items={navigationFor(user.role)}
      signOut={signOutAction}
    >
      {children}
    </AppShell>
  );
}
