// Benchmark: the register's pages per role on a register of 100,000 findings. Target: the data
// behind one page — the same calls the page makes, in the same order — in under 300 ms at
// 100,000 findings (median of the runs; the p95 is printed beside it).
//
// Run with `npx tsx --conditions=react-server bench/register.ts` (the condition makes
// `import "server-only"` a no-op). Options: `--findings N` builds N findings instead of 100,000;
// `--runs N` times each call N times (5 by default, after one untimed run that prepares its
// statements, as a running server has); `--explain` prints the query plan (EXPLAIN QUERY PLAN) of
// every statement of a page that misses the target; `--keep-files` keeps the database (its path is
// printed); `--database PATH` measures a register kept before instead of building one.
//
// The script builds the register of bench/export.ts (bench/lib/register-db.ts: 100 rooms, 2,000
// storage units, 20,000 containers, 100,000 findings with traces), then gives its people the shares
// a site has: the facilities user is the contact for 10 of the 100 rooms (and owns the units the
// builder gave them, about 400); one researcher keeps the builder's share (about 4,000 live and
// disposed containers and 400 units, a fifth of everything: the heaviest case), the other a
// typical one (about 160 live containers and 15 units; the rest go to a sixth person, the rest of the
// group). Then a fresh Node process (so nothing is cached
// from the build) runs, for each role, the pages' data calls:
//
// - Register, "One line per problem" (the default view): countFindingsBySeverity and
//   listFindingLinesPage (db/queries/findings.ts), as app/(app)/register/page.tsx calls them;
// - Register, "By location": countFindingsBySeverity, listFindingLocations and findingLinesAt for
//   the locations shown (at most 200);
// - Register, "Every finding": countFindingsBySeverity (the page) and listFindingsPage (the JSON API
//   the table reads);
//   each with the role's default view (open, acknowledged and mitigating, worst first) and with a
//   few typical filters: one severity, a room, a storage unit, a search (q) and mine=true;
// - the Overview's figures: overviewCounts, locationsClosestToLimits, recentFindingEvents and, for
//   a researcher, openFindingsContributedElsewhere (db/queries/overview.ts, location-findings.ts);
// - the "Open findings here" panels of a room, a storage unit and a container
//   (db/queries/location-findings.ts).
//
// It reports; it does not fail: the exit code is 0 either way.
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import type { SessionUser } from "@/lib/auth/session";
import type { OpenFindingsHere } from "@/lib/register/open-findings";

const argValue = (name: string) => {
  const index = process.argv.indexOf(name);
  return index >= 0 ? process.argv[index + 1] : undefined;
};
const FINDING_COUNT = Number(argValue("--findings") ?? 100_000);
const RUNS = Math.max(1, Number(argValue("--runs") ?? 5));
const EXPLAIN = process.argv.includes("--explain");
const TARGET_MS = 300;
/** Rooms (of 100) the facilities user is the contact for. */
const CONTACT_ROOM_EVERY = 10;
/** The typical researcher keeps one in this many of the containers and units the builder gave them. */
const TYPICAL_SHARE_EVERY = 20;

type Measured = { role: string; page: string; filter: string; samplesMs: number[]; rows: string };

const fixed = (value: number, digits = 0) => value.toFixed(digits);

/** The people of the bench register and the shares described in the header. */
function assignShares(sqlite: import("better-sqlite3").Database): void {
  const id = (email: string) => (sqlite.prepare("select id from users where email = ?").get(email) as { id: number }).id;
  const typical = id("bench.2@example.test");
  const facilities = id("bench.3@example.test");
  sqlite.transaction(() => {
    // The containers and units the typical researcher gives up go to the rest of their group.
    const group = Number(sqlite.prepare("insert into users (email, name, role) values ('bench.5@example.test', 'Bench group', 'researcher')").run().lastInsertRowid);
    sqlite.prepare("update rooms set facilities_contact_id = ? where id % ? = 0").run(facilities, CONTACT_ROOM_EVERY);
    sqlite.prepare("update containers set owner_id = ? where owner_id = ? and id % ? <> 0").run(group, typical, TYPICAL_SHARE_EVERY);
    sqlite.prepare("update storage_units set owner_id = ? where owner_id = ? and id % ? <> 0").run(group, typical, TYPICAL_SHARE_EVERY);
  })();
  sqlite.exec("ANALYZE");
}

/** The child process: every page's calls for every role, timed. */
async function measure(): Promise<void> {
  const { getDb, closeDb } = await import("@/db/client");
  const findingQueries = await import("@/db/queries/findings");
  const { overviewCounts, locationsClosestToLimits, recentFindingEvents } = await import("@/db/queries/overview");
  const { openFindingsInRoom, openFindingsInUnit, openFindingsOfContainer, openFindingsContributedElsewhere } = await import("@/db/queries/location-findings");
  const { scopeFor } = await import("@/lib/auth/permissions");
  const { findingListQuerySchema } = await import("@/lib/register/schemas");
  const { BUILT_IN_VIEWS } = await import("@/lib/register/views");
  const { median } = await import("./lib/stats");
  const { explainStatements } = await import("./lib/query-plan");
  const { countFindingsBySeverity, findingLinesAt, listFindingLinesPage, listFindingLocations, listFindingsPage } = findingQueries;

  const db = getDb();
  const sqlite = db.$client;
  const person = (email: string): SessionUser => sqlite.prepare("select id, email, name, role from users where email = ?").get(email) as SessionUser;
  const count = (sql: string, ...params: unknown[]) => (sqlite.prepare(sql).get(...params) as { n: number }).n;
  const roles: { label: string; user: SessionUser }[] = [
    { label: "safety officer", user: person("bench.0@example.test") },
    { label: "researcher, typical", user: person("bench.2@example.test") },
    { label: "researcher, a fifth", user: person("bench.1@example.test") },
    { label: "facilities", user: person("bench.3@example.test") },
  ];
  for (const { label, user } of roles) {
    const containersOwned = count("select count(*) as n from containers where owner_id = ? and state not in ('empty', 'disposed')", user.id);
    const unitsOwned = count("select count(*) as n from storage_units where owner_id = ?", user.id);
    const contactRooms = count("select count(*) as n from rooms where facilities_contact_id = ?", user.id);
    console.log(`${label.padEnd(20)} ${user.email}: ${containersOwned.toLocaleString("en-GB")} live containers, ${unitsOwned} units owned, contact for ${contactRooms} rooms.`);
  }

  // A busy room, one of its units and a live container there: the filters and the panels.
  const room = sqlite.prepare("select room_id as id, count(*) as n from findings group by room_id order by n desc limit 1").get() as { id: number };
  const unit = sqlite.prepare("select storage_unit_id as id from findings where room_id = ? group by storage_unit_id order by count(*) desc limit 1").get(room.id) as { id: number };

  const results: Measured[] = [];
  const time = (role: string, page: string, filter: string, run: () => string) => {
    run(); // prepares the statements, as a server that has served the page before
    const samplesMs: number[] = [];
    let rows = "";
    for (let i = 0; i < RUNS; i++) {
      const startMs = performance.now();
      rows = run();
      samplesMs.push(performance.now() - startMs);
    }
    results.push({ role, page, filter, samplesMs, rows });
    process.stderr.write(`  ${role} · ${page} · ${filter || "-"}: ${fixed(median(samplesMs))} ms\n`);
    if (EXPLAIN && median(samplesMs) >= TARGET_MS) {
      console.log(`\n${role} · ${page} · ${filter}: ${fixed(median(samplesMs))} ms. Query plans:`);
      for (const { sql, plan } of explainStatements(sqlite, () => void run())) {
        console.log(`  ${sql.replace(/\s+/g, " ").slice(0, 400)}`);
        for (const line of plan) console.log(`    ${line}`);
      }
    }
  };

  for (const { label, user } of roles) {
    const scope = scopeFor(user.role, "findings.read")!;
    const defaultView = BUILT_IN_VIEWS[user.role];
    const container = sqlite
      .prepare(
        `select c.id from containers c where c.state not in ('empty', 'disposed') and (@scope = 'all' or c.owner_id = @userId or @role <> 'researcher')
           order by c.id limit 1`,
      )
      .get({ scope, userId: user.id, role: user.role }) as { id: number };
    const filters: [string, string][] = [
      ["default view", defaultView],
      ["severity=critical", `${defaultView}&severity=critical`],
      [`roomId (busiest room)`, `${defaultView}&roomId=${room.id}`],
      [`storageUnitId`, `${defaultView}&storageUnitId=${unit.id}`],
      ["q=hexane", `${defaultView}&q=hexane`],
      ...(user.role === "auditor" ? [] : ([["mine=true", `${defaultView}&mine=true`]] as [string, string][])),
    ];
    for (const [filter, queryString] of filters) {
      const query = findingListQuerySchema.parse(Object.fromEntries(new URLSearchParams(queryString)));
      time(label, "Register: one line per problem", filter, () => {
        const counts = countFindingsBySeverity(user, scope, query);
        const { lines, total, findings } = listFindingLinesPage(user, scope, { ...query, view: "lines" });
        return `${lines.length} of ${total} lines, ${findings} findings (${Object.values(counts).reduce((a, b) => a + b, 0)} counted)`;
      });
      time(label, "Register: by location", filter, () => {
        countFindingsBySeverity(user, scope, query);
        const all = listFindingLocations(user, scope, query);
        const shown = all.slice(0, 200);
        const lines = findingLinesAt(user, scope, query, shown);
        return `${all.length} locations, lines at ${lines.size}`;
      });
      time(label, "Register: every finding", filter, () => {
        countFindingsBySeverity(user, scope, query);
        const { rows, total } = listFindingsPage(user, scope, { ...query, view: "flat" });
        return `${rows.length} of ${total} findings`;
      });
    }
    // overviewCounts is async (drizzle's $count), so the Overview is timed here rather than by time().
    const overviewSamples: number[] = [];
    let overviewRows = "";
    const overview = async () => {
      const counts = await overviewCounts(user, scope);
      const closest = locationsClosestToLimits(user, scope);
      const events = recentFindingEvents(user, scope);
      const elsewhere = user.role === "researcher" ? openFindingsContributedElsewhere(user) : null;
      const open = Object.values(counts.openFindings).reduce((a, b) => a + b, 0);
      return `${open} open findings, ${closest.length} closest, ${events.length} events${elsewhere ? `, ${elsewhere.count} elsewhere` : ""}`;
    };
    await overview();
    for (let i = 0; i < RUNS; i++) {
      const startMs = performance.now();
      overviewRows = await overview();
      overviewSamples.push(performance.now() - startMs);
    }
    results.push({ role: label, page: "Overview", filter: "", samplesMs: overviewSamples, rows: overviewRows });
    process.stderr.write(`  ${label} · Overview: ${fixed(median(overviewSamples))} ms\n`);
    if (EXPLAIN && median(overviewSamples) >= TARGET_MS) {
      console.log(`\n${label} · Overview: ${fixed(median(overviewSamples))} ms. Query plans (without overviewCounts' own counts):`);
      for (const { sql, plan } of explainStatements(sqlite, () => {
        locationsClosestToLimits(user, scope);
        recentFindingEvents(user, scope);
        if (user.role === "researcher") openFindingsContributedElsewhere(user);
      })) {
        console.log(`  ${sql.replace(/\s+/g, " ").slice(0, 400)}`);
        for (const line of plan) console.log(`    ${line}`);
      }
    }
    const here = (h: OpenFindingsHere | null) => (h ? `${h.items.length} listed, ${h.hidden.count} outside the scope` : "no such container");
    time(label, "Open findings here: room", "", () => here(openFindingsInRoom(user, scope, room.id)));
    time(label, "Open findings here: unit", "", () => here(openFindingsInUnit(user, scope, unit.id)));
    time(label, "Open findings here: container", "", () => here(openFindingsOfContainer(user, scope, container.id)));
  }
  closeDb();
  console.log(JSON.stringify({ results }));
}

function printTable(results: Measured[]): void {
  const rows = results.map((r) => {
    const sorted = [...r.samplesMs].sort((a, b) => a - b);
    const medianMs = sorted[Math.ceil(0.5 * sorted.length) - 1];
    const p95Ms = sorted[Math.ceil(0.95 * sorted.length) - 1];
    return { ...r, medianMs, p95Ms };
  });
  const widths = { role: 20, page: 32, filter: 22 };
  console.log(
    `\n${"role".padEnd(widths.role)} ${"page (its data calls)".padEnd(widths.page)} ${"filter".padEnd(widths.filter)} ${"median".padStart(8)} ${"p95".padStart(8)}  target  what it read`,
  );
  for (const r of rows) {
    console.log(
      `${r.role.padEnd(widths.role)} ${r.page.padEnd(widths.page)} ${r.filter.padEnd(widths.filter)} ${`${fixed(r.medianMs)} ms`.padStart(8)} ${`${fixed(r.p95Ms)} ms`.padStart(8)}  ${r.medianMs < TARGET_MS ? "met   " : "MISSED"}  ${r.rows}`,
    );
  }
  const missed = rows.filter((r) => r.medianMs >= TARGET_MS);
  console.log(
    `\nTarget: a page's data in under ${TARGET_MS} ms (median of ${RUNS} runs) at ${FINDING_COUNT.toLocaleString("en-GB")} findings: ` +
      (missed.length ? `${missed.length} of ${rows.length} pages missed it.` : `met by all ${rows.length} pages.`),
  );
}

async function main(): Promise<void> {
  if (process.argv.includes("--measure-only")) {
    await measure();
    return;
  }
  const keepFiles = process.argv.includes("--keep-files");
  const reused = argValue("--database");
  const tempDir = fs.mkdtempSync(path.join(os.tmpdir(), "headroom-bench-register-"));
  process.env.DATABASE_PATH = reused ?? path.join(tempDir, "register.db");
  process.env.LOG_LEVEL = "silent";
  try {
    if (!reused) {
      const { buildRegisterDb } = await import("./lib/register-db");
      await buildRegisterDb({ findings: FINDING_COUNT, shortTraces: true });
      const { getDb, closeDb } = await import("@/db/client");
      assignShares(getDb().$client);
      closeDb();
    }
    const loadAtStart = os.loadavg();
    const child = spawnSync(process.execPath, [...process.execArgv, process.argv[1], "--measure-only", ...process.argv.slice(2)], {
      env: { ...process.env },
      encoding: "utf8",
      maxBuffer: 64 * 2 ** 20,
      // Progress goes to stderr as each page is measured; the results come back on stdout.
      stdio: ["ignore", "pipe", "inherit"],
    });
    if (child.status !== 0) throw new Error("the measuring process failed (its error is above)");
    const lines = child.stdout.trim().split("\n");
    console.log(lines.slice(0, -1).join("\n"));
    printTable((JSON.parse(lines.at(-1)!) as { results: Measured[] }).results);
    const loadAtEnd = os.loadavg();
    console.log(`Load average (1 min) ${fixed(loadAtStart[0], 2)} at the start, ${fixed(loadAtEnd[0], 2)} at the end. Machine: ${os.cpus().length} cores; Node ${process.version}.`);
    if (keepFiles) console.log(`Kept: ${process.env.DATABASE_PATH}`);
  } finally {
    if (!keepFiles || reused) fs.rmSync(tempDir, { recursive: true, force: true });
  }
}

main().catch((error) => {
  console.error(error);
  process.exitCode = 1;
});
