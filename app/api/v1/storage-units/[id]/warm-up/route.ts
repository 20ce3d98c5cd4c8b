import { NextResponse } from "next/server";
import { requireId } from "@/lib/http/params";
import { route } from "@/lib/http/route";
import { unitWarmUpSummary } from "@/lib/temperatures/warm-up-store";

/**
 * A temperature-controlled unit's warm-up after a failure: τ with its source (set, fitted to the
 * unit's recorded failures, or the default of its kind), the fit's quality and history, and the
 * room temperature it warms towards.
 */
export const GET = route({ action: "locations.read" }, ({ params }) =>
  NextResponse.json({ data: unitWarmUpSummary(requireId(params, "That storage unit")) }),
);
