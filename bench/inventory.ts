// Benchmark: the inventory at scale. Two targets:
//   1. With 100,000 containers in 2,000 storage units, the container list API answers a filtered,
//      sorted page in under 50 ms at the 95th percentile.
//   2. A 10,000-row container file imports in under 5 s.
//
// Run with `npx tsx --conditions=react-server bench/inventory.ts` (the condition makes
// `import "server-only"` a no-op). Options: `--plans` prints the query plans of each kind of list
// request; `--keep-database` keeps the database file (its path is printed); `--setup-only` stops
// once the inventory is built (with --keep-database: a database to try queries on in sqlite3).
//
// The script builds its own inventory in a temporary database file and deletes it at the end.
// The list API is called in-process through its route handler, so each latency includes the
// session check, the zod parse of the query string, the queries and the JSON body, but not the
// HTTP server or the network. It reports; it does not fail: the exit code is 0 either way.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";

const tempDir = fs.mkdtempSync(path.join(os.tmpdir(), "headroom-bench-"));
process.env.DATABASE_PATH = path.join(tempDir, "inventory.db");
process.env.BCRYPT_COST = "4";
const SESSION_SECRET = "bench-session-secret-at-least-32-characters-long";
process.env.SESSION_SECRET = SESSION_SECRET;
process.env.LOG_LEVEL = "silent";

const CONTAINER_COUNT = 100_000;
const STORAGE_UNIT_COUNT = 2_000;
const UNITS_PER_ROOM = 20;
const DISPOSED_SHARE = 0.1;
const LIST_TARGET_P95_MS = 50;
const WARM_UP_REQUESTS_PER_KIND = 20;
const REQUESTS_PER_KIND = 300;
const PAGE_SIZE = 25; // the API's default
const DEEP_PAGE = 40;
const IMPORT_ROW_COUNT = 10_000;
const IMPORT_TARGET_S = 5;
const DAY_MS = 86_400_000;

const showPlans = process.argv.includes("--plans");
/** Keep the database file afterwards (its path is printed), e.g. to look at query plans in sqlite3. */
const keepDatabase = process.argv.includes("--keep-database");
/** Build the inventory and stop (with --keep-database: a database to experiment on). */
const setupOnly = process.argv.includes("--setup-only");

// Modules that open the database are imported only now, after the environment above is set.
async function main(): Promise<void> {
  const { closeDb, getDb } = await import("@/db/client");
  const { seedDemo } = await import("@/db/seed/demo");
  const { rooms, sites, storageUnits, substances, users } = await import("@/db/schema");
  const { CONTAINER_STATES } = await import("@/db/enums");
  const { listContainers } = await import("@/db/queries/container-list");
  const { containerListQuerySchema } = await import("@/lib/inventory/schemas");
  const containersRoute = await import("@/app/api/v1/containers/route");
  const { commitContainerImport } = await import("@/lib/imports/service");
  const { CONTAINER_COLUMNS } = await import("@/lib/imports/containers");
  const { SESSION_COOKIE } = await import("@/lib/auth/session");
  const { eq } = await import("drizzle-orm");
  const { sealData } = await import("iron-session");
  const Papa = (await import("papaparse")).default;
  const { median, p95, seededRandom } = await import("./lib/stats");
  const { explainStatements } = await import("./lib/query-plan");

  const random = seededRandom(20_260_401);
  const pick = <T>(items: readonly T[]): T => items[Math.floor(random() * items.length)];
  const between = (min: number, max: number) => min + random() * (max - min);
  const secondsSince = (startMs: number) => (performance.now() - startMs) / 1000;
  const fixed = (value: number, digits = 1) => value.toFixed(digits);
  const thousands = (n: number) => n.toLocaleString("en-GB");
  const verdict = (met: boolean) => (met ? "target met" : "target NOT met");

  // ---------------------------------------------------------------------------------------------
  // 1. The inventory: the demo organisation, rooms and units up to 2,000, then 100,000 containers
  // ---------------------------------------------------------------------------------------------

  const loadAtStart = os.loadavg();
  const db = getDb();
  const sqlite = db.$client;
  let startMs = performance.now();
  await seedDemo(db, { bcryptCost: 4 });
  console.log(`Demo organisation seeded in ${fixed(secondsSince(startMs), 2)} s.`);

  const people = db.select().from(users).orderBy(users.id).all();
  const safetyOfficer = people.find((p) => p.role === "safety_officer")!;
  const siteRows = db.select().from(sites).orderBy(sites.id).all();
  const substanceRows = db.select({ id: substances.id, cas: substances.cas }).from(substances).all();
  const substancesWithCas = substanceRows.filter((s): s is { id: number; cas: string } => s.cas !== null);

  startMs = performance.now();
  const insertRoom = sqlite.prepare(
    "insert into rooms (site_id, code, name, kind, floor_area_m2, height_m, air_changes_per_hour) values (?, ?, ?, 'laboratory', 40, 3, 6)",
  );
  const insertUnit = sqlite.prepare("insert into storage_units (room_id, code, name, kind, owner_id) values (?, ?, ?, ?, ?)");
  const UNIT_KINDS = ["flammable_cabinet", "open_shelving", "flammable_storage_refrigerator", "corrosives_cabinet"] as const;
  sqlite.transaction(() => {
    let missingUnits = STORAGE_UNIT_COUNT - (sqlite.prepare("select count(*) as n from storage_units").get() as { n: number }).n;
    for (let roomNumber = 1; missingUnits > 0; roomNumber++) {
      const site = siteRows[roomNumber % siteRows.length];
      const code = `L-${String(roomNumber).padStart(3, "0")}`;
      const roomId = Number(insertRoom.run(site.id, code, `Laboratory ${code}`).lastInsertRowid);
      for (let u = 1; u <= UNITS_PER_ROOM && missingUnits > 0; u++, missingUnits--) {
        insertUnit.run(roomId, `U-${String(u).padStart(2, "0")}`, `Unit ${u} of ${code}`, UNIT_KINDS[u % UNIT_KINDS.length], pick(people).id);
      }
    }
  })();

  const unitRows = db
    .select({ id: storageUnits.id, code: storageUnits.code, roomId: rooms.id, roomCode: rooms.code, siteId: sites.id, siteName: sites.name })
    .from(storageUnits)
    .innerJoin(rooms, eq(rooms.id, storageUnits.roomId))
    .innerJoin(sites, eq(sites.id, rooms.siteId))
    .orderBy(storageUnits.id)
    .all();
  const roomCount = new Set(unitRows.map((u) => u.roomId)).size;

  const LIVE_STATES = CONTAINER_STATES.filter((s) => s !== "disposed");
  const VOLUME_SIZES: [number, "mL" | "L"][] = [[100, "mL"], [250, "mL"], [500, "mL"], [1, "L"], [2.5, "L"], [4, "L"], [20, "L"]];
  const MASS_SIZES: [number, "g" | "kg"][] = [[100, "g"], [500, "g"], [1, "kg"], [5, "kg"]];
  const CONTAINER_KINDS_USED = ["glass_bottle", "glass_bottle", "plastic_bottle", "metal_can", "safety_can", "vial"] as const;

  const insertContainer = sqlite.prepare(
    `insert into containers (label, substance_id, amount, amount_unit, capacity, capacity_unit, container_kind, state,
       storage_unit_id, owner_id, received_at, opened_at, expires_at, created_at, updated_at)
     values (@label, @substanceId, @amount, @amountUnit, @capacity, @capacityUnit, @containerKind, @state,
       @storageUnitId, @ownerId, @receivedAt, @openedAt, @expiresAt, @createdAt, @updatedAt)`,
  );
  const insertMove = sqlite.prepare(
    "insert into container_moves (container_id, from_storage_unit_id, to_storage_unit_id, moved_by_id, moved_at) values (?, null, ?, ?, ?)",
  );
  const nowMs = Date.now();
  sqlite.transaction(() => {
    for (let n = 1; n <= CONTAINER_COUNT; n++) {
      const [capacity, capacityUnit] = random() < 0.85 ? pick(VOLUME_SIZES) : pick(MASS_SIZES);
      const state = random() < DISPOSED_SHARE ? "disposed" : pick(LIVE_STATES);
      const createdAt = Math.round(nowMs - between(30, 1500) * DAY_MS);
      const updatedAt = Math.round(createdAt + random() * (nowMs - createdAt));
      const unit = pick(unitRows);
      const { lastInsertRowid } = insertContainer.run({
        label: `BX-${String(n).padStart(6, "0")}`,
        substanceId: pick(substanceRows).id,
        amount: state === "empty" ? 0 : Math.round(capacity * between(0.05, 1) * 100) / 100,
        amountUnit: capacityUnit,
        capacity,
        capacityUnit,
        containerKind: pick(CONTAINER_KINDS_USED),
        state,
        storageUnitId: unit.id,
        ownerId: random() < 0.05 ? null : pick(people).id,
        receivedAt: createdAt,
        openedAt: state === "sealed" ? null : Math.round(createdAt + random() * (updatedAt - createdAt)),
        expiresAt: random() < 0.3 ? null : Math.round(createdAt + between(365, 1095) * DAY_MS),
        createdAt,
        updatedAt,
      });
      insertMove.run(lastInsertRowid, unit.id, safetyOfficer.id, createdAt);
    }
  })();
  console.log(
    `Inventory built in ${fixed(secondsSince(startMs), 2)} s: ${thousands(CONTAINER_COUNT)} containers ` +
      `(~${DISPOSED_SHARE * 100} % disposed) in ${thousands(unitRows.length)} storage units, ${thousands(roomCount)} rooms, ${siteRows.length} sites.`,
  );

  startMs = performance.now();
  sqlite.exec("ANALYZE");
  console.log(`ANALYZE run once after the bulk load, as an installation would after a big import (${fixed(secondsSince(startMs), 2)} s).`);
  if (setupOnly) {
    closeDb();
    return;
  }

  // ---------------------------------------------------------------------------------------------
  // 2. The container list API: a mix of realistic requests, each at page 1 and at a deep page
  // ---------------------------------------------------------------------------------------------

  const benchRoomUnit = unitRows.find((u) => u.roomCode.startsWith("L-"))!;
  const busiestUnitId = sqlite
    .prepare("select storage_unit_id as id from containers group by storage_unit_id order by count(*) desc limit 1")
    .get() as { id: number };
  const requestKinds: { name: string; query: string }[] = [
    { name: "default (updatedAt desc)", query: "" },
    { name: "site, by location", query: `siteId=${siteRows[0].id}&sort=location&dir=asc` },
    { name: "room, by label", query: `roomId=${benchRoomUnit.roomId}&sort=label` },
    { name: "opened, by substance", query: "state=opened&sort=substance" },
    { name: "q=acetone, by amount desc", query: "q=acetone&sort=amount&dir=desc" },
    { name: "q=BX-0123 (label prefix)", query: "q=BX-0123" },
    { name: "mine, by updatedAt desc", query: "mine=1&sort=updatedAt&dir=desc" },
    { name: "unit, by owner", query: `storageUnitId=${busiestUnitId.id}&sort=owner` },
  ];
  const sealed = await sealData({ userId: safetyOfficer.id, version: safetyOfficer.sessionVersion }, { password: SESSION_SECRET });
  const cookie = `${SESSION_COOKIE}=${sealed}`;
  const listUrl = (query: string, page: number) => `http://localhost/api/v1/containers?${query}${query ? "&" : ""}page=${page}`;

  async function timeRequest(url: string): Promise<{ latencyMs: number; total: number; rows: number }> {
    const begunMs = performance.now();
    const response = await containersRoute.GET(new Request(url, { headers: { cookie } }), { params: Promise.resolve({}) });
    const body = (await response.json()) as { data: unknown[]; total: number };
    const latencyMs = performance.now() - begunMs;
    if (response.status !== 200) throw new Error(`${url} answered ${response.status}: ${JSON.stringify(body)}`);
    return { latencyMs, total: body.total, rows: body.data.length };
  }

  // Each kind at page 1 and at a deep page: page 40, or the last page when there are fewer.
  const requests: { name: string; url: string }[] = [];
  for (const kind of requestKinds) {
    const { total } = await timeRequest(listUrl(kind.query, 1));
    const lastPage = Math.max(1, Math.ceil(total / PAGE_SIZE));
    for (const page of new Set([1, Math.min(DEEP_PAGE, lastPage)])) requests.push({ name: `${kind.name}, page ${page}`, url: listUrl(kind.query, page) });
  }

  if (showPlans) {
    console.log("\nQuery plans of the list requests (page 1):");
    for (const kind of requestKinds) {
      const query = containerListQuerySchema.parse(Object.fromEntries(new URLSearchParams(kind.query)));
      console.log(`\n## ${kind.name}`);
      for (const statement of explainStatements(sqlite, () => listContainers(query, safetyOfficer.id))) {
        console.log(`${statement.sql.slice(0, 120)}…\n  ${statement.plan.join("\n  ")}`);
      }
    }
  }

  const answers = new Map<string, { total: number; rows: number }>();
  for (const request of requests) {
    for (let i = 0; i < WARM_UP_REQUESTS_PER_KIND; i++) answers.set(request.name, await timeRequest(request.url));
  }
  // Round robin over the kinds, so a burst of load from elsewhere on the machine falls on all of them.
  const latenciesMs = new Map<string, number[]>(requests.map((r) => [r.name, []]));
  for (let round = 0; round < REQUESTS_PER_KIND; round++) {
    for (const request of requests) latenciesMs.get(request.name)!.push((await timeRequest(request.url)).latencyMs);
  }

  console.log(`\nContainer list API: ${REQUESTS_PER_KIND} requests per kind after ${WARM_UP_REQUESTS_PER_KIND} to warm up, ${PAGE_SIZE} rows a page.`);
  console.log(`${"request".padEnd(40)} ${"matches".padStart(8)} ${"median ms".padStart(10)} ${"p95 ms".padStart(8)}`);
  for (const request of requests) {
    const samples = latenciesMs.get(request.name)!;
    const answer = answers.get(request.name)!;
    console.log(`${request.name.padEnd(40)} ${thousands(answer.total).padStart(8)} ${fixed(median(samples)).padStart(10)} ${fixed(p95(samples)).padStart(8)}`);
  }
  const allLatenciesMs = [...latenciesMs.values()].flat();
  const overallP95Ms = p95(allLatenciesMs);
  console.log(
    `Overall p95 over all ${thousands(allLatenciesMs.length)} filtered, sorted requests: ${fixed(overallP95Ms)} ms ` +
      `(median ${fixed(median(allLatenciesMs))} ms): ${verdict(overallP95Ms < LIST_TARGET_P95_MS)} (< ${LIST_TARGET_P95_MS} ms).`,
  );

  // ---------------------------------------------------------------------------------------------
  // 3. Import: a 10,000-row container file of new labels, then the same file again (all unchanged)
  // ---------------------------------------------------------------------------------------------

  const header = CONTAINER_COLUMNS.map((c) => c.name);
  const importRows = Array.from({ length: IMPORT_ROW_COUNT }, (_, i) => {
    const unit = pick(unitRows);
    const [capacity, capacityUnit] = pick(VOLUME_SIZES);
    const receivedOn = new Date(nowMs - between(30, 700) * DAY_MS).toISOString().slice(0, 10);
    const row: Record<string, string> = {
      label: `IM-${String(i + 1).padStart(6, "0")}`,
      cas: pick(substancesWithCas).cas,
      amount: String(Math.round(capacity * between(0.1, 1) * 100) / 100),
      amount_unit: capacityUnit,
      capacity: String(capacity),
      capacity_unit: capacityUnit,
      container_kind: pick(CONTAINER_KINDS_USED),
      state: pick(LIVE_STATES),
      site: unit.siteName,
      room: unit.roomCode,
      storage_unit: unit.code,
      owner_email: pick(people).email,
      received_on: receivedOn,
      expires_on: random() < 0.5 ? "" : new Date(nowMs + between(100, 1000) * DAY_MS).toISOString().slice(0, 10),
    };
    return header.map((column) => row[column] ?? "");
  });
  const csvBytes = new TextEncoder().encode(Papa.unparse([header, ...importRows], { newline: "\r\n" }));
  const actor = { id: safetyOfficer.id, email: safetyOfficer.email, name: safetyOfficer.name, role: safetyOfficer.role };

  console.log(`\nImport of a ${thousands(IMPORT_ROW_COUNT)}-row container file (${fixed(csvBytes.length / 1024 / 1024, 2)} MB CSV):`);
  for (const run of ["first import (all new)", "re-import (all unchanged)"]) {
    startMs = performance.now();
    const counts = await commitContainerImport(actor, { bytes: csvBytes, fileName: "bench-containers.csv" });
    const durationS = secondsSince(startMs);
    console.log(
      `  ${run.padEnd(26)} ${fixed(durationS, 2)} s, ${thousands(Math.round(IMPORT_ROW_COUNT / durationS))} rows/s ` +
        `(${counts.created} created, ${counts.updated} updated, ${counts.unchanged} unchanged): ${verdict(durationS < IMPORT_TARGET_S)} (< ${IMPORT_TARGET_S} s).`,
    );
  }

  // ---------------------------------------------------------------------------------------------
  // 4. The machine, so the figures can be read in context
  // ---------------------------------------------------------------------------------------------

  const cpus = os.cpus();
  console.log(
    `\nMachine: Node ${process.version}, ${cpus.length} × ${cpus[0]?.model ?? "unknown CPU"}, ` +
      `load average (1 / 5 / 15 min) ${loadAtStart.map((l) => fixed(l, 2)).join(" / ")} at the start, ` +
      `${os.loadavg().map((l) => fixed(l, 2)).join(" / ")} at the end, ` +
      `SQLite ${(sqlite.prepare("select sqlite_version() as v").get() as { v: string }).v}.`,
  );

  closeDb();
}

main()
  .catch((error: unknown) => {
    console.error(error);
    process.exitCode = 1;
  })
  .finally(() => {
    if (keepDatabase) console.log(`Database kept at ${process.env.DATABASE_PATH}`);
    else fs.rmSync(tempDir, { recursive: true, force: true });
  });
