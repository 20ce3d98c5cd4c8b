import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { FormMessage } from "@/components/ui/form-message";
import { getSessionUser } from "@/lib/auth/session";
import { buttonClass } from "@/components/ui/button";
import { ssoConfigured } from "@/lib/sso/client";
import { SignInForm } from "./sign-in-form";

export const metadata: Metadata = { title: "Sign in" };

const SSO_PROBLEMS: Record<string, string> = {
  off: "Sign-in with your institution is not set up on this installation. Sign in with your password.",
  limited: "Too many sign-in attempts from this address. Try again in 15 minutes.",
  unavailable: "Your institution's sign-in service could not be reached. Try again in a few minutes; if it keeps failing, tell your administrator.",
};

export default async function SignInPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const params = await searchParams;
  if (await getSessionUser()) redirect("/");
  const sso = ssoConfigured();
  return (
    <div>
      <h1 className="text-2xl font-semibold tracking-tight text-ink-950">Sign in to Headroom</h1>
      <p className="mt-1.5 mb-7 text-sm text-ink-600">Use the e-mail address your organisation registered for you.</p>
      {params.reset ? (
        <div className="mb-5">
          <FormMessage success="Your password was changed. Sign in with the new one." />
        </div>
      ) : null}
      {params.sso && SSO_PROBLEMS[params.sso] ? (
        <div className="mb-5">
          <FormMessage errors={[SSO_PROBLEMS[params.sso]]} />
        </div>
      ) : null}
      {sso ? (
        <div className="mb-6">
          {/* A plain link: the start is a GET that sets its own cookie and redirects to the provider. */}
          <a href="/sso" className={`${buttonClass("primary")} w-full`}>
            Sign in with your institution
          </a>
          <p className="mt-6 flex items-center gap-3 text-xs uppercase tracking-wide text-ink-500">
            <span className="h-px flex-1 bg-ink-200" aria-hidden="true" />
            or with a password
            <span className="h-px flex-1 bg-ink-200" aria-hidden="true" />
          </p>
        </div>
      ) : null}
      <SignInForm next={params.next} />
    </div>
  );
}
