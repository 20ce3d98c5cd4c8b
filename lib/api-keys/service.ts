import "server-only";
import { createHash, randomBytes } from "node:crypto";
import { desc, eq } from "drizzle-orm";
import { getDb, type DbOrTx } from "@/db/client";
import { apiKeys, type ApiKey } from "@/db/schema";
import { recordAudit, type AuditActor } from "@/lib/audit/record";
import type { SessionUser } from "@/lib/auth/session";
import { ConflictError, NotFoundError } from "@/lib/errors";

import type { ApiKeyScope } from "./scopes";

function hashKey(key: string): string {
  return createHash("sha256").update(key).digest("hex");
}

/** A new random key: `hrk_` and 24 random bytes in base64url (36 characters). */
export function generateApiKey(): string {
  return `hrk_${randomBytes(24).toString("base64url")}`;
}

/**
 * Stores a key inside the caller's transaction (only its SHA-256 and its first 12 characters) with
 * its audit event. `createApiKey` is the way in for people; the demo seed uses this with its
 * published demo key.
 */
export function storeApiKey(
  tx: DbOrTx,
  actor: AuditActor,
  input: { name: string; scopes: ApiKeyScope[]; key: string; createdById: number | null },
): ApiKey {
  const row = tx
    .insert(apiKeys)
    .values({ name: input.name, prefix: input.key.slice(0, 12), keyHash: hashKey(input.key), scopes: input.scopes, createdById: input.createdById })
    .returning()
    .get();
  recordAudit(tx, actor, { action: "create", entityType: "api_key", entityId: row.id, summary: `Created API key “${row.name}” (${row.prefix}…) for ${input.scopes.join(", ")}` });
  return row;
}

/** Creates a key; the key itself is returned this once and only its SHA-256 is stored. */
export function createApiKey(actor: SessionUser, input: { name: string; scopes: ApiKeyScope[] }): { key: string; apiKey: ApiKey } {
  const key = generateApiKey();
  const apiKey = getDb().transaction((tx) => storeApiKey(tx, actor, { ...input, key, createdById: actor.id }));
  return { key, apiKey };
}

export function revokeApiKey(actor: SessionUser, id: number): ApiKey {
  return getDb().transaction((tx) => {
    const row = tx.select().from(apiKeys).where(eq(apiKeys.id, id)).get();
    if (!row) throw new NotFoundError("That API key");
    if (row.revokedAt) throw new ConflictError("That API key is already revoked.");
    const after = tx.update(apiKeys).set({ revokedAt: new Date() }).where(eq(apiKeys.id, id)).returning().get();
    recordAudit(tx, actor, { action: "revoke", entityType: "api_key", entityId: id, summary: `Revoked API key “${row.name}” (${row.prefix}…)` });
    return after;
  });
}

export function listApiKeys() {
  return getDb()
    .select({ id: apiKeys.id, name: apiKeys.name, prefix: apiKeys.prefix, scopes: apiKeys.scopes, createdAt: apiKeys.createdAt, lastUsedAt: apiKeys.lastUsedAt, revokedAt: apiKeys.revokedAt })
    .from(apiKeys)
    .orderBy(desc(apiKeys.createdAt), desc(apiKeys.id))
    .all();
}

/** The live key for an `Authorization: Bearer …` header, or null (missing, unknown or revoked). */
export function authenticateApiKey(authorization: string | null): ApiKey | null {
  const match = /^Bearer\s+(\S{10,200})$/i.exec(authorization?.trim() ?? "");
  if (!match) return null;
  const row = getDb().select().from(apiKeys).where(eq(apiKeys.keyHash, hashKey(match[1]))).get();
  if (!row || row.revokedAt) return null;
  getDb().update(apiKeys).set({ lastUsedAt: new Date() }).where(eq(apiKeys.id, row.id)).run();
  return row;
}
