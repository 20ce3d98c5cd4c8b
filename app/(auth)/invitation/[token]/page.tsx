import type { Metadata } from "next";
import Link from "next/link";
import { findInvitation } from "@/lib/users/service";
import { acceptInvitationAction } from "../../actions";
import { SetPasswordForm } from "../../set-password-form";

export const metadata: Metadata = { title: "Accept invitation" };

export default async function InvitationPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const invitation = findInvitation(token);
  if (!invitation) {
    return (
      <div>
        <h1 className="text-2xl font-semibold tracking-tight text-ink-950">This invitation no longer works</h1>
        <p className="mt-2 text-sm text-ink-600">
          Invitation links work once and expire after seven days. Ask your Headroom administrator to send a new one.
        </p>
        <p className="mt-6 text-sm">
          <Link href="/sign-in" className="text-accent-700 hover:underline">
            Go to sign-in
          </Link>
        </p>
      </div>
    );
  }
  return (
    <div>
      <h1 className="text-2xl font-semibold tracking-tight text-ink-950">Activate your account</h1>
      <p className="mt-1.5 mb-7 text-sm text-ink-600">Choose a password; you will be signed in straight away.</p>
      <SetPasswordForm
        token={token}
        action={acceptInvitationAction}
        email={invitation.email}
        defaultName={invitation.name}
        submitLabel="Activate and sign in"
      />
    </div>
  );
}
