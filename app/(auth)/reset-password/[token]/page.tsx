import type { Metadata } from "next";
import Link from "next/link";
import { findPasswordReset } from "@/lib/users/service";
import { resetPasswordAction } from "../../actions";
import { SetPasswordForm } from "../../set-password-form";

export const metadata: Metadata = { title: "Choose a new password" };

export default async function ResetPasswordTokenPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const reset = findPasswordReset(token);
  if (!reset) {
    return (
      <div>
        <h1 className="text-2xl font-semibold tracking-tight text-ink-950">This link no longer works</h1>
        <p className="mt-2 text-sm text-ink-600">Reset links work once and expire after 60 minutes.</p>
        <p className="mt-6 text-sm">
          <Link href="/reset-password" className="text-accent-700 hover:underline">
            Ask for a new link
          </Link>
        </p>
      </div>
    );
  }
  return (
    <div>
      <h1 className="text-2xl font-semibold tracking-tight text-ink-950">Choose a new password</h1>
      <p className="mt-1.5 mb-7 text-sm text-ink-600">Other sessions of this account will be signed out.</p>
      <SetPasswordForm token={token} action={resetPasswordAction} email={reset.email} submitLabel="Save new password" />
    </div>
  );
}
