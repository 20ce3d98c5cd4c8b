import { expect, type APIRequestContext } from "@playwright/test";
import { EMAIL_FAKE_URL } from "../../../playwright.config";

type Captured = { to: string[]; subject: string; text: string | null };

/** Reads the local e-mail fake's captured messages. */
export class Mailbox {
  constructor(private readonly request: APIRequestContext) {}

  async latestTo(address: string, subject: string | RegExp): Promise<Captured> {
    let found: Captured | undefined;
    await expect
      .poll(
        async () => {
          const response = await this.request.get(`${EMAIL_FAKE_URL}/emails`);
          const body = (await response.json()) as { data: Captured[] };
          found = body.data.find((m) => m.to.includes(address) && (typeof subject === "string" ? m.subject === subject : subject.test(m.subject)));
          return Boolean(found);
        },
        { message: `an e-mail to ${address}`, timeout: 15_000 },
      )
      .toBe(true);
    return found!;
  }

  static linkIn(message: Captured, path: string): string {
    const match = message.text?.match(new RegExp(`https?://[^\\s]+${path}/[A-Za-z0-9_-]+`));
    if (!match) throw new Error(`No ${path} link in: ${message.text}`);
    return match[0];
  }
}
