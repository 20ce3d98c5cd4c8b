/**
 * A unit warming in an open excursion: its warm-up projected from the latest reading with the
 * unit's τ, the clock times at which its contents cross their thresholds (earliest first), and the
 * second warning when a crossing is less than an hour away — once per excursion and threshold.
 * Runs on the invented demo organisation: the −20 °C freezer FZ-1 (sensor S-206) holds methanol
 * and ethanol; its room's worst case is 27.0 °C.
 */
import { beforeAll, describe, expect, it } from "vitest";
import { eq, like } from "drizzle-orm";
import { getDb } from "@/db/client";
import { seedDemo } from "@/db/seed/demo";
import { emailMessages, excursionCrossingAlerts, excursions, users } from "@/db/schema";
import { checkCrossingAlerts } from "@/lib/alerts/crossing-alerts";
import { crossingText, projectOpenExcursion } from "@/lib/temperatures/projection";
import { openWarmingExcursionOnFz1 } from "./helpers/warming-freezer";

const NOW = Date.parse("2026-12-04T22:00:00Z");
let excursionId: number;

beforeAll(async () => {
  const db = getDb();
  await seedDemo(db, { bcryptCost: 4, nowMs: Date.parse("2026-12-02T09:07:00Z") });
  // τ set to one hour, so that the projection is worked by hand below.
  const fz1 = openWarmingExcursionOnFz1(db, NOW);
  excursionId = fz1.excursionId;
  // The unit's owner hears about excursions as they happen.
  db.update(users).set({ alertExcursions: "immediate" }).where(eq(users.id, fz1.ownerId ?? -1)).run();
  db.update(users).set({ alertExcursions: "immediate" }).where(eq(users.email, "safety@example.org")).run();
});

describe("an open excursion projected", () => {
  it("warms from the latest reading towards the room with the unit's τ, and crosses methanol's LFL at a clock time", () => {
    const projection = projectOpenExcursion(getDb(), getDb().select().from(excursions).where(eq(excursions.id, excursionId)).get()!, NOW)!;
    expect(projection.latest.tempC).toBe(0);
    expect(projection.tauMin).toBe(60);
    expect(projection.tauSource).toBe("set");
    expect(projection.roomTempC).toBe(27);
    // The curve: T(t) = 27 − 27·e^(−t/60); after 60 min 27 × (1 − e^−1) = 17.07 °C.
    const hourLater = projection.curve.find((p) => p.atMs === NOW + 60 * 60_000);
    expect(hourLater?.tempC).toBeCloseTo(17.07, 2);
    const lfl = projection.crossings.find((c) => c.name === "methanol" && c.threshold === "LFL" && c.rule === "enclosure-lfl")!;
    // Methanol's LFL at about 6.6 °C (VDI Heat Atlas 2nd ed.: 6,177 Pa at 280 K; LFL 6.0 % of 101.325 kPa):
    // t = −60 × ln((27 − 6.6)/27) = 16.8 min after 22:00 → about 22:15 UTC (rounded down to five minutes).
    expect((lfl.at!.getTime() - NOW) / 60_000).toBeGreaterThan(16.0);
    expect((lfl.at!.getTime() - NOW) / 60_000).toBeLessThan(17.6);
    expect(crossingText(lfl, projection.latest.at)).toBe("methanol: LFL at about 22:15 UTC");
    // Earliest first.
    const times = projection.crossings.filter((c) => c.at).map((c) => c.at!.getTime());
    expect(times).toEqual([...times].sort((a, b) => a - b));
  });

  it("warns once when a crossing is less than an hour away, and records which thresholds it warned of", () => {
    const before = getDb().select().from(emailMessages).where(like(emailMessages.subject, "Within the hour%")).all().length;
    const queued = checkCrossingAlerts(getDb(), NOW);
    expect(queued).toBeGreaterThan(0);
    const mails = getDb().select().from(emailMessages).where(like(emailMessages.subject, "Within the hour%")).all();
    expect(mails.length - before).toBe(queued);
    expect(mails.at(-1)!.subject).toMatch(/^Within the hour at .*FZ-1.*: /);
    expect(mails.at(-1)!.text).toContain("methanol: LFL at about 22:15 UTC");
    const recorded = getDb().select().from(excursionCrossingAlerts).where(eq(excursionCrossingAlerts.excursionId, excursionId)).all();
    expect(recorded.length).toBeGreaterThan(0);
    // Again a minute later: nothing new.
    expect(checkCrossingAlerts(getDb(), NOW + 60_000)).toBe(0);
  });
});
