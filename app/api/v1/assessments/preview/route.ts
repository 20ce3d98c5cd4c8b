import { NextResponse } from "next/server";
import { assessmentPreviewSchema, previewStoring } from "@/lib/assessment/preview";
import { route } from "@/lib/http/route";
import { limit } from "@/lib/rate-limit";

/**
 * What-if: `{ storageUnitId, substanceId | mixtureId, amount, amountUnit }` → the findings storing
 * it there would raise or make worse. Writes nothing.
 */
export const POST = route({ action: "assessments.preview", schema: assessmentPreviewSchema }, async ({ user, input }) => {
  await limit("whatIfUser", user.id);
  return NextResponse.json({ data: previewStoring(input) });
});
