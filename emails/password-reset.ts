import { renderEmail, type RenderedEmail } from "./layout";

export function passwordResetEmail(input: { name: string; link: string; expiresInMinutes: number }): RenderedEmail {
  return renderEmail("Reset your Headroom password", "Reset your password", [
    { kind: "p", text: `Hello ${input.name}, someone asked to reset the password of your Headroom account.` },
    { kind: "button", label: "Choose a new password", href: input.link },
    {
      kind: "small",
      text: `The link works once and expires in ${input.expiresInMinutes} minutes. If you did not ask for this, ignore this message: your password stays as it is.`,
    },
  ]);
}
