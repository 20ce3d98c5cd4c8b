/** The retry schedule and the secret's encryption at rest. */
import { describe, expect, it } from "vitest";
import { MAX_ATTEMPTS, retryDelayMs } from "@/lib/webhooks/deliver";
import { decryptWebhookSecret, encryptWebhookSecret, generateWebhookSecret } from "@/lib/webhooks/secret";

describe("retries", () => {
  it("waits 30 s, 2 min, 10 min, 1 h, 6 h, 24 h (±20 %), then gives up after the 7th attempt", () => {
    const middle = () => 0.5;
    expect([1, 2, 3, 4, 5, 6].map((n) => retryDelayMs(n, middle))).toEqual([30_000, 120_000, 600_000, 3_600_000, 21_600_000, 86_400_000]);
    expect(MAX_ATTEMPTS).toBe(7);
    expect(retryDelayMs(7, middle)).toBeNull();
    expect(retryDelayMs(1, () => 0)).toBe(24_000);
    expect(retryDelayMs(1, () => 0.999999)).toBe(36_000);
  });
});

describe("the signing secret at rest", () => {
  it("is a Standard Webhooks secret, encrypted with a fresh nonce each time, and read back", () => {
    const secret = generateWebhookSecret();
    expect(secret).toMatch(/^whsec_[A-Za-z0-9+/]{43}=$/);
    const a = encryptWebhookSecret(secret);
    const b = encryptWebhookSecret(secret);
    expect(a).not.toBe(b);
    expect(a).not.toContain(secret.slice(6));
    expect(decryptWebhookSecret(a)).toBe(secret);
    expect(decryptWebhookSecret(b)).toBe(secret);
  });

  it("refuses a tampered value or another server's", () => {
    const stored = encryptWebhookSecret(generateWebhookSecret());
    const bytes = Buffer.from(stored.slice(3), "base64");
    bytes[bytes.length - 1] ^= 1;
    expect(() => decryptWebhookSecret(`v1:${bytes.toString("base64")}`)).toThrow("The signing secret cannot be decrypted (SESSION_SECRET changed?). Rotate the secret and give the new one to the receiver.");
    expect(() => decryptWebhookSecret("v0:abc")).toThrow("Rotate the secret.");
  });
});
