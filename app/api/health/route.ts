import { NextResponse } from "next/server";
import { sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { publicRoute } from "@/lib/http/route";

export const dynamic = "force-dynamic";

export const GET = publicRoute(() => {
  getDb().get(sql`select 1`);
  return NextResponse.json({ status: "ok", database: "ok", time: new Date().toISOString() });
});
