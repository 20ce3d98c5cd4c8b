/**
 * A new edition of the substance library reaches an installation's copy once: substances nobody
 * edited take the library's values and sources, a person's edits stay, the change is in the audit
 * log and every room is queued for re-assessment.
 */
import { beforeAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { auditEvents, exposureLimits, jobs, rooms, settings, sites, substances } from "@/db/schema";
import { LIBRARY_EDITION_KEY, refreshSubstanceLibrary, seedSubstanceLibrary, SUBSTANCE_LIBRARY_EDITION } from "@/db/seed/substances";
import { applySubstanceLibraryEdition } from "@/lib/substances/library-edition";
import { makeUser } from "./helpers/world";

const byCas = (cas: string) => getDb().select().from(substances).where(eq(substances.cas, cas)).get()!;

beforeAll(() => {
  const db = getDb();
  db.transaction((tx) => seedSubstanceLibrary(tx));
  const site = db.insert(sites).values({ name: "Edition test campus" }).returning().get();
  db.insert(rooms).values({ siteId: site.id, code: "E-1", name: "Edition test lab" }).run();
});

describe("the substance library's edition", () => {
  it("is recorded by seeding, so a fresh installation refreshes nothing", () => {
    expect(getDb().select().from(settings).where(eq(settings.key, LIBRARY_EDITION_KEY)).get()?.value).toBe(SUBSTANCE_LIBRARY_EDITION);
    expect(getDb().transaction((tx) => refreshSubstanceLibrary(tx))).toBeNull();
  });

  it("brings unedited substances of an older installation up to date, keeps a person's edits, and says so", () => {
    const db = getDb();
    const editor = makeUser("safety_officer");
    // An installation seeded from an older edition: acetone as it was then, ethanol edited by a person.
    db.update(settings).set({ value: "2026-01-01" }).where(eq(settings.key, LIBRARY_EDITION_KEY)).run();
    const acetone = byCas("67-64-1");
    db.update(substances)
      .set({ liquidDensityKgPerM3: 790, sources: { ...acetone.sources, liquidDensityKgPerM3: "liquid density near 20 °C recalled from memory" } })
      .where(eq(substances.id, acetone.id))
      .run();
    db.delete(exposureLimits).where(eq(exposureLimits.substanceId, acetone.id)).run();
    const ethanol = byCas("64-17-5");
    db.update(substances).set({ liquidDensityKgPerM3: 800, updatedById: editor.id }).where(eq(substances.id, ethanol.id)).run();
    const jobsBefore = db.select().from(jobs).all().length;

    const refreshed = applySubstanceLibraryEdition(db)!;

    expect(refreshed).toContain(acetone.id);
    expect(refreshed).not.toContain(ethanol.id);
    const after = byCas("67-64-1");
    // CRC Handbook 95th ed., Physical Constants of Organic Compounds: acetone 0.7845 g/cm³ at 25 °C.
    expect(after.liquidDensityKgPerM3).toBeCloseTo(784.5, 6);
    expect(after.sources.liquidDensityKgPerM3).toMatch(/CRC Handbook/);
    expect(JSON.stringify(after.sources)).not.toMatch(/memory/i);
    expect(db.select().from(exposureLimits).where(eq(exposureLimits.substanceId, acetone.id)).all().length).toBeGreaterThan(0);
    expect(byCas("64-17-5").liquidDensityKgPerM3).toBe(800);
    expect(db.select().from(settings).where(eq(settings.key, LIBRARY_EDITION_KEY)).get()?.value).toBe(SUBSTANCE_LIBRARY_EDITION);
    const audit = db.select().from(auditEvents).where(and(eq(auditEvents.entityType, "substance"), eq(auditEvents.actorLabel, "substance library"))).all();
    expect(audit).toHaveLength(1);
    expect(audit[0].summary).toMatch(new RegExp(`^Substance library brought up to its ${SUBSTANCE_LIBRARY_EDITION} edition: ${refreshed.length} substances`));
    const queued = db.select().from(jobs).all();
    expect(queued.length).toBe(jobsBefore + 1);
    expect(queued.at(-1)?.status).toBe("queued");

    // Once per edition.
    expect(applySubstanceLibraryEdition(db)).toBeNull();
  });
});
