import { renderEmail, type RenderedEmail } from "./layout";

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
