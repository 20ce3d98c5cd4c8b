import { NextResponse } from "next/server";
import { assessmentPreviewSchema, previewStoring } from "@/lib/assessment/preview";
import { route } from "@/lib/http/route";

/**
 * What-if: `{ storageUnitId, substanceId | mixtureId, amount, amountUnit }` → the findings storing
 * it there would raise or make worse. Writes nothing.
 */
export const POST = route({ action: "assessments.preview", schema: assessmentPreviewSchema }, ({ input }) => NextResponse.json({ data: previewStoring(input) }));
