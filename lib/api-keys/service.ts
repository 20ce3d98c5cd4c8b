import "server-only";
import { createHash, randomBytes } from "node:crypto";
import { desc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { apiKeys, type ApiKey } from "@/db/schema";
import { recordAudit } from "@/lib/audit/record";
import type { SessionUser } from "@/lib/auth/session";
import { ConflictError, NotFoundError } from "@/lib/errors";

import type { ApiKeyScope } from "./scopes";

function hashKey(key: string): string {
  return createHash("sha256").update(key).digest("hex");
}

/** Creates a key; the key itself is returned this once and only its SHA-256 is stored. */
export function createApiKey(actor: SessionUser, input: { name: string; scopes: ApiKeyScope[] }): { key: string; apiKey: ApiKey } {
  const key = `hrk_${randomBytes(24).toString("base64url")}`;
  const apiKey = getDb().transaction((tx) => {
    const row = tx
      .insert(apiKeys)
      .values({ name: input.name, prefix: key.slice(0, 12), keyHash: hashKey(key), scopes: input.scopes, createdById: actor.id })
      .returning()
      .get();
    recordAudit(tx, actor, { action: "create", entityType: "api_key", entityId: row.id, summary: `Created API key “${row.name}” (${row.prefix}…) for ${input.scopes.join(", ")}` });
    return row;
  });
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
