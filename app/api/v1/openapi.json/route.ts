import { NextResponse } from "next/server";
import { apiDocument } from "@/lib/api-docs/document";
import { publicRoute } from "@/lib/http/route";

/** The OpenAPI 3.1 document of this API. Public: it describes the routes, never data. */
export const GET = publicRoute(() =>
  NextResponse.json(apiDocument(), { headers: { "Cache-Control": "public, max-age=300" } }),
);
