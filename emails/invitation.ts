import { renderEmail, type RenderedEmail } from "./layout";

/** The invitation for a person who signs in through their institution: no password, no link to set one. */
export function ssoInvitationEmail(input: { inviteeName: string; inviterName: string; roleLabel: string; signInLink: string }): RenderedEmail {
  return renderEmail("You are invited to Headroom", `Welcome to Headroom, ${input.inviteeName}`, [
    {
      kind: "p",
      text: `${input.inviterName} has invited you to Headroom, where your organisation keeps its register of vapor hazards in chemical storage. Your role: ${input.roleLabel}.`,
    },
    {
      kind: "p",
      text: "You sign in with your institution's account: no separate password. Open Headroom and choose “Sign in with your institution”. Your role follows your groups there.",
    },
    { kind: "button", label: "Open Headroom", href: input.signInLink },
    { kind: "small", text: "If you did not expect this invitation, ignore this message." },
  ]);
}

/** Sent instead of a reset link when the account signs in through the institution. */
export function ssoPasswordResetEmail(input: { name: string; signInLink: string }): RenderedEmail {
  return renderEmail("Your Headroom account has no password", "Sign in with your institution", [
    {
      kind: "p",
      text: `Hello ${input.name}, someone asked to reset the password of your Headroom account. Your account signs in through your institution, so it has no Headroom password to reset.`,
    },
    { kind: "p", text: "Open Headroom and choose “Sign in with your institution”. If that fails, your institution's help desk manages that password." },
    { kind: "button", label: "Open Headroom", href: input.signInLink },
  ]);
}

export function invitationEmail(input: {
  inviteeName: string;
  inviterName: string;
  roleLabel: string;
  link: string;
  expiresInDays: number;
}): RenderedEmail {
  return renderEmail("You are invited to Headroom", `Welcome to Headroom, ${input.inviteeName}`, [
    {
      kind: "p",
      text: `${input.inviterName} has invited you to Headroom, where your organisation keeps its register of vapor hazards in chemical storage. Your role: ${input.roleLabel}.`,
    },
    { kind: "p", text: "Choose a password to activate your account." },
    { kind: "button", label: "Set your password", href: input.link },
    {
      kind: "small",
      text: `The link works once and expires in ${input.expiresInDays} days. If you did not expect this invitation, ignore this message.`,
    },
  ]);
}
