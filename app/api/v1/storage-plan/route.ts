import { NextResponse } from "next/server";
import { planStorage, storagePlanSchema } from "@/lib/assessment/storage-plan";
import { route } from "@/lib/http/route";
import { limit } from "@/lib/rate-limit";

/**
 * The storage planner: where this could be stored instead, best first. Query:
 * `substanceId` or `mixtureId` (exactly one), `amount` (> 0) and `amountUnit` (mL, L, g, kg);
 * optional `siteId` (only units at that site), `roomId` (the room to be near), `containerId` (plans
 * moving that stored container: its own unit is left out, and its room is the one to be near
 * unless `roomId` is given; researchers: their own containers only, else 403) and `limit` (1–50,
 * 20 by default). Who may log containers may ask (else 403); an unknown substance, mixture, site,
 * room or container answers 404.
 *
 * Answer: `{ data: [{ storageUnitId, code, name, unitKind, roomId, roomCode, roomName, siteId,
 * siteName, verdict, worstSeverity, maxRatio, timeToDanger, raised, nearness, reason }] }`, the
 * live units whose internal volume can hold what they hold plus this amount, ranked: the verdict
 * from the unit's point of view (`no_findings`, then `already_flagged`, then `raises`), then the
 * lowest worst severity, then the longest time to danger (`{ minutes, threshold, tempC }` or null:
 * none after a failure, ranking best), then nearness (`same_room`, `same_site`, `other_site`).
 * When no unit can hold the amount, `data` is empty and `message` says so.
 */
export const GET = route({ action: "containers.write", schema: storagePlanSchema }, async ({ user, input }) => {
  await limit("whatIfUser", user.id);
  const plan = planStorage(input, user);
  return NextResponse.json({ data: plan.items, ...(plan.message ? { message: plan.message } : {}) });
});
