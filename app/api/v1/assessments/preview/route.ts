import { NextResponse } from "next/server";
import { assessmentPreviewSchema, previewStoring } from "@/lib/assessment/preview";
import { route } from "@/lib/http/route";
import { limit } from "@/lib/rate-limit";

/**
 * What-if, writing nothing. Input: `{ storageUnitId, substanceId | mixtureId, amount, amountUnit,
 * state? }` for a new container; with `containerId` too, an edit of that stored container; or
 * `{ storageUnitId, containerId }` alone, a move: the container's stored contents are taken out of
 * its place and assessed at storageUnitId. A stored container needs the right to change it
 * (researchers: their own, else 403).
 *
 * Answer: `{ data: { storageUnitId, findings, current, verdict, verdictSentence, cleared, alternatives } }`:
 * - `findings`: the new or worse findings the change would raise (`isNew`, `previous`);
 * - `current`: the findings standing at that unit and among its room's own about the same
 *   substance or its group (a mixture holding it, open containers together, a quantity limit),
 *   each `{ id, rule, severity, status, scenario, title, value, limit, ratio, unit, about,
 *   outcome: "unchanged" | "worse" | "better" | "cleared", after, canOpen }`, whether or not the
 *   change alters them;
 * - `verdict`: `"raises"` (some finding new or worse), `"already_flagged"` (none, but findings
 *   about it stand there and stay) or `"no_findings"`; `verdictSentence` says it in plain words;
 * - `cleared`: for a move, the findings at the old place that would go (`{ id, severity, title,
 *   canOpen }`), else empty;
 * - `alternatives`: when the verdict is not `"no_findings"`, up to five places safer than this unit,
 *   best first, in the storage planner's shape (GET /api/v1/storage-plan), near the container's
 *   place (a new container: this unit's room), at that site first; else empty.
 */
export const POST = route({ action: "assessments.preview", schema: assessmentPreviewSchema }, async ({ user, input }) => {
  await limit("whatIfUser", user.id);
  return NextResponse.json({ data: previewStoring(input, user) });
});
