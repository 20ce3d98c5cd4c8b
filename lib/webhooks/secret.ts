import "server-only";
import { createCipheriv, createDecipheriv, hkdfSync, randomBytes } from "node:crypto";
import { sessionSecret } from "@/lib/config";

/** A new signing secret in the Standard Webhooks form: `whsec_` and 32 random bytes in base64. */
export function generateWebhookSecret(): string {
  return `whsec_${randomBytes(32).toString("base64")}`;
}

const VERSION = "v1";

/** AES-256 key derived from SESSION_SECRET with HKDF-SHA-256 for this one purpose. */
function key(): Buffer {
  return Buffer.from(hkdfSync("sha256", sessionSecret(), "headroom-webhooks", "webhook signing secrets v1", 32));
}

/** `v1:` + base64(iv ‖ tag ‖ ciphertext), AES-256-GCM: the server can sign, the database alone reveals nothing. */
export function encryptWebhookSecret(secret: string): string {
  const iv = randomBytes(12);
  const cipher = createCipheriv("aes-256-gcm", key(), iv);
  const encrypted = Buffer.concat([cipher.update(secret, "utf8"), cipher.final()]);
  return `${VERSION}:${Buffer.concat([iv, cipher.getAuthTag(), encrypted]).toString("base64")}`;
}

export class SecretUnreadableError extends Error {}

export function decryptWebhookSecret(stored: string): string {
  const [version, body] = stored.split(":", 2);
  if (version !== VERSION || !body) throw new SecretUnreadableError("The signing secret is stored in a form this version cannot read. Rotate the secret.");
  const bytes = Buffer.from(body, "base64");
  try {
    const decipher = createDecipheriv("aes-256-gcm", key(), bytes.subarray(0, 12));
    decipher.setAuthTag(bytes.subarray(12, 28));
    return Buffer.concat([decipher.update(bytes.subarray(28)), decipher.final()]).toString("utf8");
  } catch {
    throw new SecretUnreadableError("The signing secret cannot be decrypted (SESSION_SECRET changed?). Rotate the secret and give the new one to the receiver.");
  }
}
