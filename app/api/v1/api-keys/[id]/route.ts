import { NextResponse } from "next/server";
import { revokeApiKey } from "@/lib/api-keys/service";
import { requireId } from "@/lib/http/params";
import { route } from "@/lib/http/route";

/** Revokes a key: it stops working at once and stays listed for the record. */
export const DELETE = route({ action: "apiKeys.manage" }, ({ params, user }) => {
  const revoked = revokeApiKey(user, requireId(params, "That API key"));
  return NextResponse.json({ data: { id: revoked.id, name: revoked.name, prefix: revoked.prefix, revokedAt: revoked.revokedAt } });
});
