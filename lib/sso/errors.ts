import { DomainError } from "@/lib/errors";

export const SSO_ACCOUNT_MESSAGE = "This account signs in through your institution. Use “Sign in with your institution” instead of a password.";
export const SSO_REQUIRED_MESSAGE = "Password sign-in is switched off on this installation. Use “Sign in with your institution”.";

/** A password sign-in refused because the account, or the whole installation, uses single sign-on. */
export class SsoRequiredError extends DomainError {
  constructor(message: string) {
    super("sso_required", message, 403);
  }
}
