import { NextResponse } from "next/server";
import { apiKeyCreateSchema } from "@/lib/api-keys/schemas";
import { createApiKey, listApiKeys } from "@/lib/api-keys/service";
import { route } from "@/lib/http/route";

export const GET = route({ action: "apiKeys.manage" }, () => {
  const data = listApiKeys();
  return NextResponse.json({ data, page: 1, pageSize: data.length, total: data.length });
});

/** Creates a key. The answer carries the key itself, this once; Headroom keeps only its hash. */
export const POST = route({ action: "apiKeys.manage", schema: apiKeyCreateSchema }, ({ user, input }) => {
  const { key, apiKey } = createApiKey(user, input);
  return NextResponse.json(
    { data: { id: apiKey.id, name: apiKey.name, prefix: apiKey.prefix, scopes: apiKey.scopes, createdAt: apiKey.createdAt }, key },
    { status: 201 },
  );
});
