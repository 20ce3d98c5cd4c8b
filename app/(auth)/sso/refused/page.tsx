import type { Metadata } from "next";
import { getIronSession } from "iron-session";
import { cookies } from "next/headers";
import Link from "next/link";
import { buttonClass } from "@/components/ui/button";
import { ssoCookieOptions, type SsoCookieData, type SsoPageRefusal } from "@/lib/sso/state-cookie";

export const metadata: Metadata = { title: "No access" };

const ASK_ADMIN = "Ask your organisation's Headroom administrator (the person who invited you, or your safety office).";

function explanation(refusal: SsoPageRefusal): { title: string; lines: string[] } {
  switch (refusal.reason) {
    case "no_group":
      return {
        title: "Your institution's groups give no access to Headroom",
        lines: [
          "You signed in at your institution, but none of your groups there is linked to a role in Headroom, so no account was opened.",
          `${ASK_ADMIN} They can link one of your groups to a role, or your institution's directory team can add you to the right group.`,
        ],
      };
    case "not_invited":
      return {
        title: "You have not been invited to Headroom",
        lines: [
          "Your institution confirmed who you are, but Headroom has no account for this address and does not open accounts for its domain by itself.",
          `${ASK_ADMIN} They can invite you for sign-in with your institution.`,
        ],
      };
    case "deactivated":
      return { title: "Your Headroom account is deactivated", lines: [`Signing in is not possible while it is. ${ASK_ADMIN}`] };
    case "no_email":
      return { title: "Your institution sent no e-mail address", lines: [`Headroom finds your account by your e-mail address. ${ASK_ADMIN}`] };
    case "email_unverified":
      return {
        title: "Your institution has not verified your e-mail address",
        lines: [`Headroom links an account only to a verified address. Verify it at your institution, or ${ASK_ADMIN.charAt(0).toLowerCase()}${ASK_ADMIN.slice(1)}`],
      };
    case "other_identity":
      return {
        title: "This address belongs to another sign-in",
        lines: [`The Headroom account for this address is linked to a different identity at your institution. ${ASK_ADMIN}`],
      };
    case "break_glass":
      return {
        title: "This account signs in with its password",
        lines: ["It is the break-glass administrator account, kept for when single sign-on is unavailable. Sign in with its e-mail address and password instead."],
      };
    case "state":
      return {
        title: "This sign-in could not be checked",
        lines: [
          "It was started in another browser or tab, took longer than 10 minutes, or was already used. Nothing was changed and you are not signed in.",
          "Start again with “Sign in with your institution”.",
        ],
      };
    case "provider":
      return {
        title: "Your institution did not sign you in",
        lines: ["The sign-in was cancelled or its answer failed Headroom's checks. Nothing was changed and you are not signed in. Try again; if it keeps failing, tell your administrator."],
      };
  }
}

export default async function SsoRefusedPage() {
  const data = await getIronSession<SsoCookieData>(await cookies(), ssoCookieOptions());
  const refusal = data.refusal;
  if (!refusal) {
    return (
      <div>
        <h1 className="text-2xl font-semibold tracking-tight text-ink-950">Nothing to show</h1>
        <p className="mt-2 text-sm text-ink-600">There is no recent sign-in to explain. Start again from the sign-in page.</p>
        <Link href="/sign-in" className={`${buttonClass("primary")} mt-6`}>Go to sign-in</Link>
      </div>
    );
  }
  const { title, lines } = explanation(refusal);
  const showGroups = refusal.reason === "no_group" || refusal.reason === "not_invited";
  return (
    <div>
      <h1 className="text-2xl font-semibold tracking-tight text-ink-950">{title}</h1>
      <div role="alert" className="mt-4 space-y-3 text-sm text-ink-700">
        {lines.map((line) => (
          <p key={line}>{line}</p>
        ))}
      </div>
      {refusal.email ? (
        <p className="mt-4 text-sm text-ink-700">
          Address received: <span className="font-medium text-ink-900">{refusal.email}</span>
        </p>
      ) : null}
      {showGroups ? (
        <div className="mt-4 text-sm text-ink-700">
          <p>Groups received from your institution:</p>
          {refusal.groups.length ? (
            <ul className="mt-1 list-disc pl-5" aria-label="Groups received">
              {refusal.groups.slice(0, 50).map((group) => (
                <li key={group} className="font-mono text-xs text-ink-900">{group}</li>
              ))}
            </ul>
          ) : (
            <p className="mt-1 font-medium text-ink-900">none</p>
          )}
        </div>
      ) : null}
      <p className="mt-6 text-sm text-ink-600">You are not signed in to Headroom.</p>
      <Link href="/sign-in" className={`${buttonClass("secondary")} mt-4`}>Back to sign-in</Link>
    </div>
  );
}
