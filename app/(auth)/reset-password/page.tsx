import type { Metadata } from "next";
import Link from "next/link";
import { RequestResetForm } from "./request-reset-form";

export const metadata: Metadata = { title: "Reset password" };

export default function ResetPasswordPage() {
  return (
    <div>
      <h1 className="text-2xl font-semibold tracking-tight text-ink-950">Reset your password</h1>
      <p className="mt-1.5 mb-7 text-sm text-ink-600">We will e-mail you a link that works once, for 60 minutes.</p>
      <RequestResetForm />
      <p className="mt-6 text-center text-sm">
        <Link href="/sign-in" className="text-accent-700 hover:underline">
          Back to sign-in
        </Link>
      </p>
    </div>
  );
}
