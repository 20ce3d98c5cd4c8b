import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { FormMessage } from "@/components/ui/form-message";
import { getSessionUser } from "@/lib/auth/session";
import { SignInForm } from "./sign-in-form";

export const metadata: Metadata = { title: "Sign in" };

export default async function SignInPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const params = await searchParams;
  if (await getSessionUser()) redirect("/");
  return (
    <div>
      <h1 className="text-2xl font-semibold tracking-tight text-ink-950">Sign in to Headroom</h1>
      <p className="mt-1.5 mb-7 text-sm text-ink-600">Use the e-mail address your organisation registered for you.</p>
      {params.reset ? (
        <div className="mb-5">
          <FormMessage success="Your password was changed. Sign in with the new one." />
        </div>
      ) : null}
      <SignInForm next={params.next} />
    </div>
  );
}
