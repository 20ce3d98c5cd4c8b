/**
 * A register database for the benchmarks: the sourced substance library, 3 sites, 100 rooms with 20
 * storage units each, 20,000 containers, 100 sensors with 2,000 readings each, 1,000 excursions and
 * `findings` findings (100,000 by default), each with a calculation trace from the hazard engine
 * (the closed-enclosure bound over six containers: inputs with sources, every step, result and
 * warnings), stored with its readable text as the register stores it. Written into the database
 * DATABASE_PATH names (set it before calling). Five people (bench.0@example.test … bench.4:
 * safety officer, two researchers, facilities, auditor) without passwords.
 */
const SITE_COUNT = 3;
const ROOM_COUNT = 100;
const UNITS_PER_ROOM = 20;
const CONTAINER_COUNT = 20_000;
const SENSOR_COUNT = 100;
const READINGS_PER_SENSOR = 2_000;
const EXCURSION_COUNT = 1_000;
const DAY_MS = 86_400_000;

const fixed = (value: number, digits = 1) => value.toFixed(digits);
const thousands = (n: number) => n.toLocaleString("en-GB");

export type RegisterDbOptions = {
  /** Findings to build (100,000 by default). */
  findings?: number;
  /** A five-row trace per finding instead of the engine's full one. */
  shortTraces?: boolean;
};

export async function buildRegisterDb({ findings: FINDING_COUNT = 100_000, shortTraces: SHORT_TRACES = false }: RegisterDbOptions = {}): Promise<void> {
  const { closeDb, getDb } = await import("@/db/client");
  const { seedSubstanceLibrary } = await import("@/db/seed/substances");
  const { substances, users } = await import("@/db/schema");
  const { enclosureBound } = await import("@/lib/hazard");
  const { toVaporProperties } = await import("@/lib/substances/vapor");
  const { seededRandom } = await import("./stats");
  const { citingWith, traceText } = await import("@/lib/register/trace-text");

  const random = seededRandom(20_260_802);
  const pick = <T>(items: readonly T[]): T => items[Math.floor(random() * items.length)];
  const between = (min: number, max: number) => min + random() * (max - min);
  const db = getDb();
  const sqlite = db.$client;
  const startMs = performance.now();

  db.transaction((tx) => seedSubstanceLibrary(tx));
  const people = ["safety_officer", "researcher", "researcher", "facilities", "auditor"].map((role, i) =>
    db.insert(users).values({ email: `bench.${i}@example.test`, name: `Bench person ${i}`, role: role as "researcher" }).returning().get(),
  );
  const library = db.select().from(substances).all().filter((s) => s.physicalState === "liquid" && s.correlations.length > 0);

  // A pool of real engine traces: each liquid of the library at several worst-case temperatures.
  // Each with its readable text, rendered as the register renders it (long sources cited from trace_sources).
  type Pooled = { substanceId: number; name: string; json: string; text: string; sourceIds: string; ppm: number; tempC: number };
  const pool: Pooled[] = [];
  const insertSource = sqlite.prepare("insert into trace_sources (text) values (?) on conflict (text) do update set text = excluded.text returning id");
  const sourceIds = new Map<string, number>();
  const sourceId = (text: string) => {
    if (!sourceIds.has(text)) sourceIds.set(text, (insertSource.get(text) as { id: number }).id);
    return sourceIds.get(text)!;
  };
  for (const substance of library) {
    for (const tempC of [8, 22, 28, 31, 35]) {
      const bound = enclosureBound({
        props: toVaporProperties(substance),
        substanceName: substance.name,
        propertySources: substance.sources,
        tempC,
        tempSource: `${tempC.toFixed(1)} °C, design maximum`,
        freeVolumeM3: 0.15,
        containers: [
          { label: "BX-000123", massG: 790, open: true },
          { label: "BX-000124", massG: 395, open: false },
          { label: "BX-000125", massG: 1580, open: true },
          { label: "BX-000126", massG: 120.5, open: true },
          { label: "BX-000127", massG: 790, open: false },
          { label: "BX-000128", massG: 2370, open: false },
        ],
        scenario: "largest-container",
      });
      const shortTrace = {
        method: "Closed-enclosure bound",
        steps: [
          { label: "Worst-case temperature", value: tempC, unit: "°C" },
          { label: "Saturated concentration", value: bound.saturatedPpm, unit: "ppm", formula: "C_sat = 10⁶ · Psat / Patm" },
          { label: "Inventory-limited concentration", value: bound.inventoryPpm, unit: "ppm", formula: "C_inv = (m/M)·Vm / V_free" },
          { label: "Worst-case concentration", value: bound.concentrationPpm, unit: "ppm", formula: "C_max = min(C_sat, C_inv)" },
        ],
        warnings: [],
      };
      const trace = SHORT_TRACES ? shortTrace : bound.trace;
      const citing = citingWith(sourceId);
      const text = traceText(trace, citing.cite);
      pool.push({ substanceId: substance.id, name: substance.name, json: JSON.stringify(trace), text, sourceIds: JSON.stringify(citing.ids()), ppm: bound.concentrationPpm, tempC });
    }
  }

  const insertSite = sqlite.prepare("insert into sites (name) values (?)");
  const insertRoom = sqlite.prepare(
    "insert into rooms (site_id, code, name, kind, floor_area_m2, height_m, air_changes_per_hour, design_max_temp_c) values (?, ?, ?, 'laboratory', 40, 3, 6, 28)",
  );
  const insertUnit = sqlite.prepare(
    "insert into storage_units (room_id, code, name, kind, internal_volume_l, set_min_c, set_max_c, excursion_threshold_c, owner_id) values (?, ?, ?, ?, ?, ?, ?, ?, ?)",
  );
  const insertContainer = sqlite.prepare(
    "insert into containers (label, substance_id, amount, amount_unit, state, storage_unit_id, owner_id, received_at) values (?, ?, ?, 'mL', ?, ?, ?, ?)",
  );
  const insertSensor = sqlite.prepare("insert into sensors (external_id, name, room_id, storage_unit_id) values (?, ?, ?, ?)");
  const insertReading = sqlite.prepare("insert into readings (sensor_id, at, temp_c) values (?, ?, ?)");
  const insertExcursion = sqlite.prepare(
    "insert into excursions (sensor_id, room_id, storage_unit_id, threshold_c, start_at, end_at, peak_temp_c, peak_at) values (?, ?, ?, ?, ?, ?, ?, ?)",
  );
  const insertFinding = sqlite.prepare(
    `insert into findings (fingerprint, rule, severity, status, scenario, title, site_id, room_id, storage_unit_id, substance_id,
       value, limit_value, ratio, unit, worst_case_temp_c, worst_case_source, assignee_id, mitigation_plan, risk_accepted_until,
       first_raised_at, last_evaluated_at, resolved_at)
     values (@fingerprint, @rule, @severity, @status, @scenario, @title, @siteId, @roomId, @unitId, @substanceId,
       @value, @limitValue, @ratio, @unit, @worstCaseTempC, @worstCaseSource, @assigneeId, @mitigationPlan, @riskAcceptedUntil,
       @firstRaisedAt, @lastEvaluatedAt, @resolvedAt)`,
  );
  // As TraceWriter stores them: traceText's text is XML-safe.
  const insertTrace = sqlite.prepare("insert into finding_traces (finding_id, trace, text, text_xml_safe, source_ids) values (?, ?, ?, 1, ?)");

  const nowMs = Date.now();
  const units: { id: number; roomId: number; siteId: number; code: string }[] = [];
  const roomsBuilt: { id: number; siteId: number }[] = [];
  sqlite.transaction(() => {
    const siteIds = Array.from({ length: SITE_COUNT }, (_, i) => Number(insertSite.run(`Bench site ${i + 1}`).lastInsertRowid));
    const UNIT_KINDS = ["flammable_cabinet", "open_shelving", "flammable_storage_refrigerator", "domestic_refrigerator"] as const;
    for (let r = 1; r <= ROOM_COUNT; r++) {
      const siteId = siteIds[r % SITE_COUNT];
      const code = `L-${String(r).padStart(3, "0")}`;
      const roomId = Number(insertRoom.run(siteId, code, `Laboratory ${code}`).lastInsertRowid);
      roomsBuilt.push({ id: roomId, siteId });
      for (let u = 1; u <= UNITS_PER_ROOM; u++) {
        const kind = UNIT_KINDS[u % UNIT_KINDS.length];
        const cold = kind.endsWith("refrigerator");
        const unitCode = `U-${String(u).padStart(2, "0")}`;
        const id = Number(insertUnit.run(roomId, unitCode, `Unit ${u} of ${code}`, kind, cold ? 150 : 400, cold ? 2 : null, cold ? 8 : null, cold ? 10 : null, pick(people).id).lastInsertRowid);
        units.push({ id, roomId, siteId, code: unitCode });
      }
    }
    for (let n = 1; n <= CONTAINER_COUNT; n++) {
      const state = random() < 0.1 ? "disposed" : pick(["sealed", "opened", "in_use"]);
      insertContainer.run(`BX-${String(n).padStart(6, "0")}`, pick(library).id, Math.round(between(50, 2500)), state, pick(units).id, pick(people).id, Math.round(nowMs - between(30, 900) * DAY_MS));
    }
    for (let s = 1; s <= SENSOR_COUNT; s++) {
      const onUnit = s % 2 === 0;
      const unit = pick(units);
      const sensorId = Number(insertSensor.run(`LOG-${String(s).padStart(3, "0")}`, `Logger ${s}`, onUnit ? null : unit.roomId, onUnit ? unit.id : null).lastInsertRowid);
      for (let i = 0; i < READINGS_PER_SENSOR; i++) insertReading.run(sensorId, nowMs - (READINGS_PER_SENSOR - i) * 15 * 60_000, (onUnit ? 5 : 21) + between(-2, 3));
      for (let e = 0; e < EXCURSION_COUNT / SENSOR_COUNT; e++) {
        const startAt = nowMs - between(2, 300) * DAY_MS;
        insertExcursion.run(sensorId, onUnit ? null : unit.roomId, onUnit ? unit.id : null, onUnit ? 10 : 30, Math.round(startAt), Math.round(startAt + between(30, 600) * 60_000), onUnit ? 14 : 32, Math.round(startAt + 20 * 60_000));
      }
    }
    const SEVERITIES = ["critical", "high", "moderate", "low"] as const;
    const STATUSES = ["open", "open", "acknowledged", "mitigating", "resolved", "risk_accepted"] as const;
    const SCENARIOS = ["in_control", "control_lost", "room_worst_case", "spill"] as const;
    for (let n = 1; n <= FINDING_COUNT; n++) {
      const unit = pick(units);
      const traced = pick(pool);
      const scenario = pick(SCENARIOS);
      const status = pick(STATUSES);
      const raisedAt = Math.round(nowMs - between(1, 400) * DAY_MS);
      const limitPpm = pick([25, 50, 100, 250, 500, 1000]);
      const findingId = insertFinding.run({
        fingerprint: `enclosure-oel|unit:${unit.id}|substance:${traced.substanceId}|${scenario}|${n}`,
        rule: "enclosure-oel",
        severity: pick(SEVERITIES),
        status,
        scenario,
        title: `${traced.name} in ${unit.code} could reach ${Math.round(traced.ppm)} ppm at ${traced.tempC} °C`,
        siteId: unit.siteId,
        roomId: unit.roomId,
        unitId: unit.id,
        substanceId: traced.substanceId,
        value: traced.ppm,
        limitValue: limitPpm,
        ratio: traced.ppm / limitPpm,
        unit: "ppm",
        worstCaseTempC: traced.tempC,
        worstCaseSource: `${traced.tempC.toFixed(1)} °C, design maximum`,
        assigneeId: status === "mitigating" ? people[0].id : null,
        mitigationPlan: status === "mitigating" ? "Move the open bottles to the flammable-storage refrigerator and re-check." : null,
        riskAcceptedUntil: status === "risk_accepted" ? Math.round(nowMs + 90 * DAY_MS) : null,
        firstRaisedAt: raisedAt,
        lastEvaluatedAt: Math.round(raisedAt + random() * (nowMs - raisedAt)),
        resolvedAt: status === "resolved" ? nowMs - DAY_MS : null,
      }).lastInsertRowid;
      insertTrace.run(findingId, traced.json, traced.text, traced.sourceIds);
    }
  })();
  sqlite.exec("ANALYZE");
  const traceBytes = (sqlite.prepare("select sum(length(trace)) as json, sum(length(text)) as text from finding_traces").get() as { json: number; text: number });
  console.log(
    `Register built in ${fixed((performance.now() - startMs) / 1000, 2)} s: ${thousands(FINDING_COUNT)} findings ` +
      `(${SHORT_TRACES ? "short traces" : "full engine traces"}: ${fixed(traceBytes.json / 2 ** 20)} MB of JSON, ${fixed(traceBytes.text / 2 ** 20)} MB as text, ${pool.length} distinct), ${thousands(CONTAINER_COUNT)} containers, ` +
      `${thousands(units.length)} storage units in ${roomsBuilt.length} rooms, ${SENSOR_COUNT} sensors with ${thousands(SENSOR_COUNT * READINGS_PER_SENSOR)} readings, ` +
      `${thousands(EXCURSION_COUNT)} excursions.`,
  );
  closeDb();
}

