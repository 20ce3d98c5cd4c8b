/**
 * Demo data: an invented organisation, the Corvane Institute, with two sites. Every name, person
 * and address here is made up for the demo; none refers to a real institution, person or brand.
 * The demo accounts share the password below and exist for trying Headroom out only.
 */
import bcrypt from "bcryptjs";
import { count } from "drizzle-orm";
import type { Db } from "@/db/client";
import { rooms, sites, storageUnits, users, type NewRoom, type NewStorageUnit, type Role } from "@/db/schema";
import { seedDemoSso } from "./demo-sso";
import { recordAudit } from "@/lib/audit/record";
import { seedDemoInventory } from "./demo-inventory";
import { seedDemoTemperatures } from "./demo-readings";
import { reassessRooms } from "@/lib/assessment/service";
import { seedSubstanceLibrary } from "./substances";

export const DEMO_PASSWORD = "headroom-demo";

export const DEMO_ACCOUNTS: { email: string; name: string; role: Role }[] = [
  { email: "admin@example.org", name: "Dana Whitlock", role: "admin" },
  { email: "safety@example.org", name: "Priya Halden", role: "safety_officer" },
  { email: "researcher@example.org", name: "Jonas Ekberg", role: "researcher" },
  { email: "facilities@example.org", name: "Mireille Okafor", role: "facilities" },
  { email: "auditor@example.org", name: "Samuel Brandt", role: "auditor" },
];

type RoomSeed = Omit<NewRoom, "siteId" | "facilitiesContactId"> & { units: Omit<NewStorageUnit, "roomId" | "ownerId">[]; unitsOwnedByResearcher?: boolean };

const NORTH_ROOMS: RoomSeed[] = [
  {
    code: "B-014",
    name: "Solvent store",
    kind: "storeroom",
    floorAreaM2: 24,
    heightM: 3,
    airChangesPerHour: 6,
    mixingFactor: 0.5,
    designMaxTempC: 32,
    // Store policy: above 30 °C for an hour is an excursion, well before the design maximum.
    excursionThresholdC: 30,
    excursionMinDurationMin: 60,
    sprinklered: true,
    notes: "Basement store beside the loading bay; south wall gets afternoon sun.",
    units: [
      { code: "FC-1", name: "Flammable-liquid cabinet, 45 gal", kind: "flammable_cabinet", internalVolumeL: 300, ventilated: false, ignitionSourceFree: true },
      { code: "FC-2", name: "Flammable-liquid cabinet, 30 gal", kind: "flammable_cabinet", internalVolumeL: 200, ventilated: false, ignitionSourceFree: true },
      { code: "CC-1", name: "Corrosives cabinet", kind: "corrosives_cabinet", internalVolumeL: 250, ventilated: true, ignitionSourceFree: false },
      { code: "SH-1", name: "Steel shelving, bulk containers", kind: "open_shelving", ventilated: true, ignitionSourceFree: false },
    ],
  },
  {
    code: "2.107",
    name: "Teaching laboratory",
    kind: "laboratory",
    floorAreaM2: 96,
    heightM: 3.2,
    airChangesPerHour: 8,
    mixingFactor: 0.5,
    designMaxTempC: 28,
    sprinklered: true,
    unitsOwnedByResearcher: true,
    units: [
      { code: "FR-1", name: "Refrigerator (domestic type)", kind: "domestic_refrigerator", internalVolumeL: 150, setMinC: 2, setMaxC: 8, excursionThresholdC: 8, excursionMinDurationMin: 30, ventilated: false, ignitionSourceFree: false },
      { code: "FC-3", name: "Under-hood flammable cabinet", kind: "flammable_cabinet", internalVolumeL: 110, ventilated: true, ignitionSourceFree: true },
      { code: "SH-2", name: "Reagent shelf", kind: "open_shelving", ventilated: true, ignitionSourceFree: false },
    ],
  },
  {
    code: "2.115",
    name: "Synthesis laboratory",
    kind: "laboratory",
    floorAreaM2: 60,
    heightM: 3,
    airChangesPerHour: 10,
    mixingFactor: 0.5,
    designMaxTempC: 27,
    sprinklered: true,
    unitsOwnedByResearcher: true,
    units: [
      { code: "FSR-1", name: "Flammable-storage refrigerator", kind: "flammable_storage_refrigerator", internalVolumeL: 280, setMinC: 2, setMaxC: 8, excursionThresholdC: 8, excursionMinDurationMin: 30, ventilated: false, ignitionSourceFree: true },
      { code: "FZ-1", name: "Freezer −20 °C", kind: "freezer_minus_20", internalVolumeL: 200, setMinC: -25, setMaxC: -15, excursionThresholdC: -10, excursionMinDurationMin: 30, ventilated: false, ignitionSourceFree: false },
      { code: "FZ-2", name: "Ultra-low freezer −80 °C", kind: "freezer_minus_80", internalVolumeL: 500, setMinC: -86, setMaxC: -70, excursionThresholdC: -60, excursionMinDurationMin: 20, ventilated: false, ignitionSourceFree: false },
      { code: "FC-4", name: "Flammable-liquid cabinet, 12 gal", kind: "flammable_cabinet", internalVolumeL: 90, ventilated: false, ignitionSourceFree: true },
    ],
  },
  {
    code: "B-020",
    name: "Walk-in cold room",
    kind: "cold_room",
    floorAreaM2: 12,
    heightM: 2.6,
    airChangesPerHour: 0.5,
    mixingFactor: 0.5,
    designMaxTempC: 8,
    setMinC: 2,
    setMaxC: 8,
    excursionThresholdC: 8,
    excursionMinDurationMin: 45,
    sprinklered: false,
    notes: "Recirculating cooling, no fresh-air supply; door alarm after 5 minutes open.",
    units: [{ code: "SH-3", name: "Stainless shelving", kind: "open_shelving", ventilated: false, ignitionSourceFree: false }],
  },
];

const RIVERSIDE_ROOMS: RoomSeed[] = [
  {
    code: "R-1.02",
    name: "Analytical laboratory",
    kind: "laboratory",
    floorAreaM2: 40,
    heightM: 2.8,
    airChangesPerHour: 6,
    mixingFactor: 0.5,
    designMaxTempC: 29,
    sprinklered: true,
    units: [
      { code: "XR-1", name: "Explosion-proof refrigerator", kind: "explosion_proof_refrigerator", internalVolumeL: 400, setMinC: 2, setMaxC: 8, excursionThresholdC: 8, excursionMinDurationMin: 30, ventilated: false, ignitionSourceFree: true },
      { code: "FC-5", name: "Flammable-liquid cabinet, 30 gal", kind: "flammable_cabinet", internalVolumeL: 200, ventilated: false, ignitionSourceFree: true },
    ],
  },
  {
    code: "R-0.05",
    name: "Chemical store",
    kind: "storeroom",
    floorAreaM2: 15,
    heightM: 2.5,
    airChangesPerHour: 2,
    mixingFactor: 0.3,
    designMaxTempC: 35,
    sprinklered: false,
    notes: "Unconditioned ground-floor store.",
    units: [
      { code: "FC-6", name: "Flammable-liquid cabinet, 45 gal", kind: "flammable_cabinet", internalVolumeL: 300, ventilated: false, ignitionSourceFree: true },
      { code: "SH-4", name: "Shelving", kind: "open_shelving", ventilated: false, ignitionSourceFree: false },
    ],
  },
  {
    code: "R-0.08",
    name: "Cryogen fill room",
    kind: "other",
    floorAreaM2: 10,
    heightM: 2.7,
    airChangesPerHour: 3,
    mixingFactor: 0.5,
    designMaxTempC: 30,
    sprinklered: false,
    units: [{ code: "CA-1", name: "Dewar and dry-ice area", kind: "cryogen_area", ventilated: true, ignitionSourceFree: false }],
  },
];

/** Local atmospheric pressure at an elevation, standard atmosphere: P = 101.325·(1 − 2.25577×10⁻⁵·h)^5.25588 kPa. */
function pressureAtElevationKPa(elevationM: number): number {
  return Math.round(101.325 * (1 - 2.25577e-5 * elevationM) ** 5.25588 * 100) / 100;
}

export async function isDatabaseEmpty(db: Db): Promise<boolean> {
  return (await db.$count(users)) === 0;
}

/**
 * Loads the substance library when the substances table is empty, then the demo organisation when
 * there are no users yet, each in one transaction. Returns whether the organisation was seeded.
 * The demo's history (readings, receipts) ends at `nowMs`.
 */
export async function seedDemo(db: Db, options: { bcryptCost?: number; nowMs?: number } = {}): Promise<boolean> {
  const nowMs = options.nowMs ?? Date.now();
  db.transaction((tx) => {
    const loaded = seedSubstanceLibrary(tx);
    if (loaded > 0) {
      recordAudit(tx, { system: "substance library" }, {
        action: "seed",
        entityType: "substance",
        summary: `Loaded the substance library (${loaded} substances, every value with its source)`,
      });
    }
  });
  if (!(await isDatabaseEmpty(db))) return false;
  const cost = options.bcryptCost ?? 12;
  const hash = await bcrypt.hash(DEMO_PASSWORD, cost);
  db.transaction((tx) => {
    const existing = tx.select({ n: count() }).from(users).get();
    if ((existing?.n ?? 0) > 0) return;
    const people = Object.fromEntries(
      DEMO_ACCOUNTS.map((account) => [
        account.role,
        tx.insert(users).values({ ...account, passwordHash: hash }).returning().get(),
      ]),
    ) as Record<Role, typeof users.$inferSelect>;

    const north = tx
      .insert(sites)
      .values({ name: "North Campus", address: "1 Quarry Lane, Eastmoor (demo address)", elevationM: 35, atmosphericPressureKPa: 101.325 })
      .returning()
      .get();
    const riverside = tx
      .insert(sites)
      .values({
        name: "Riverside Annex",
        address: "18 Millrace Road, Upper Fenwick (demo address)",
        elevationM: 420,
        atmosphericPressureKPa: pressureAtElevationKPa(420),
      })
      .returning()
      .get();

    for (const [site, roomSeeds] of [
      [north, NORTH_ROOMS],
      [riverside, RIVERSIDE_ROOMS],
    ] as const) {
      for (const { units, unitsOwnedByResearcher, ...roomSeed } of roomSeeds) {
        const room = tx
          .insert(rooms)
          .values({ ...roomSeed, siteId: site.id, facilitiesContactId: people.facilities.id })
          .returning()
          .get();
        for (const unit of units) {
          tx.insert(storageUnits)
            .values({ ...unit, roomId: room.id, ownerId: unitsOwnedByResearcher ? people.researcher.id : people.safety_officer.id })
            .run();
        }
      }
    }
    // Single sign-on: group rules and one person invited to sign in with the institution.
    seedDemoSso(tx, people.admin);
    const containerCount = seedDemoInventory(tx, { researcherId: people.researcher.id, safetyId: people.safety_officer.id, facilitiesId: people.facilities.id }, nowMs);
    const temperatures = seedDemoTemperatures(tx, db.$client, { adminId: people.admin.id, facilities: people.facilities }, nowMs);
    // The first assessment of every location: the register starts where the demo's data puts it.
    const register = reassessRooms(tx, tx.select({ id: rooms.id }).from(rooms).all().map((r) => r.id), { nowMs, notify: false, reason: "the demo seed" });
    recordAudit(tx, { system: "demo seed" }, {
      action: "seed",
      entityType: "installation",
      summary:
        `Loaded the demo organisation (invented data): 2 sites, their rooms and units, ${containerCount} containers, ` +
        `${temperatures.sensors} sensors with ${temperatures.readings} readings and ${temperatures.excursions} excursions, the demo ingest key, and ${register.raised} findings from the first assessment`,
    });
  });
  return true;
}
