import "server-only";
import { createHash, randomBytes } from "node:crypto";
import { and, eq, gt, isNull } from "drizzle-orm";
import type { DbOrTx } from "@/db/client";
import { userTokens, type UserTokenKind } from "@/db/schema";

export function hashToken(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}

/** Issues a single-use token; earlier unused tokens of the same kind for that user stop working. */
export function issueUserToken(
  tx: DbOrTx,
  input: { userId: number; kind: UserTokenKind; ttlMs: number; createdById?: number | null; now?: number },
): string {
  const now = input.now ?? Date.now();
  tx.update(userTokens)
    .set({ usedAt: new Date(now) })
    .where(and(eq(userTokens.userId, input.userId), eq(userTokens.kind, input.kind), isNull(userTokens.usedAt)))
    .run();
  const token = randomBytes(32).toString("base64url");
  tx.insert(userTokens)
    .values({
      userId: input.userId,
      kind: input.kind,
      tokenHash: hashToken(token),
      expiresAt: new Date(now + input.ttlMs),
      createdById: input.createdById ?? null,
    })
    .run();
  return token;
}

/** The token's row when it is of that kind, unused and unexpired; otherwise undefined. */
export function findUsableToken(tx: DbOrTx, token: string, kind: UserTokenKind, now = Date.now()) {
  if (!token || token.length > 200) return undefined;
  return tx
    .select()
    .from(userTokens)
    .where(
      and(
        eq(userTokens.tokenHash, hashToken(token)),
        eq(userTokens.kind, kind),
        isNull(userTokens.usedAt),
        gt(userTokens.expiresAt, new Date(now)),
      ),
    )
    .get();
}

export function markTokenUsed(tx: DbOrTx, tokenId: number, now = Date.now()): boolean {
  const result = tx
    .update(userTokens)
    .set({ usedAt: new Date(now) })
    .where(and(eq(userTokens.id, tokenId), isNull(userTokens.usedAt)))
    .run();
  return result.changes === 1;
}
