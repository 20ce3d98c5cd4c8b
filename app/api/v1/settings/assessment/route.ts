import { NextResponse } from "next/server";
import { saveAssessmentSettings } from "@/lib/assessment/settings";
import { assessmentSettingsSchema } from "@/lib/assessment/rules";
import { loadAssessmentSettings } from "@/lib/assessment/service";
import { route } from "@/lib/http/route";

/** The thresholds and assumptions the assessment applies (defaults until a safety officer changes them). */
export const GET = route({ action: "findings.read" }, () => NextResponse.json({ data: loadAssessmentSettings() }));

/** Replaces them; every location is re-assessed in a background job (its id is returned). */
export const PUT = route({ action: "hazardSettings.write", schema: assessmentSettingsSchema }, ({ user, input }) =>
  NextResponse.json({ data: { ...saveAssessmentSettings(user, input), settings: loadAssessmentSettings() } }, { status: 202 }),
);
