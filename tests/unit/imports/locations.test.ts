import { describe, expect, it } from "vitest";
import { LOCATION_COLUMNS, validateLocationRows, type ImportIssue, type ParsedTable } from "@/lib/imports";

const siteLookups = { siteIdByName: (name: string) => (name.toLowerCase() === "north campus" ? 1 : undefined) };

const ROOM = {
  site: "North Campus",
  room_code: "B-014",
  room_name: "Solvent store",
  room_kind: "storeroom",
  floor_area_m2: "18",
  height_m: "2.8",
  air_changes_per_hour: "6",
  mixing_factor: "0.4",
  design_max_temp_c: "30",
  sprinklered: "yes",
};
const CABINET = {
  unit_code: "FC-1",
  unit_name: "Flammables cabinet 1",
  unit_kind: "flammable_cabinet",
  internal_volume_l: "450",
  ventilated: "no",
  ignition_source_free: "yes",
};
const FRIDGE = {
  unit_code: "FR-2",
  unit_name: "Flammable-storage refrigerator",
  unit_kind: "flammable_storage_refrigerator",
  internal_volume_l: "150",
  set_min_c: "2",
  set_max_c: "8",
  excursion_threshold_c: "10",
  excursion_min_duration_min: "30",
};

/** Rows on lines 2, 3, … under a header with every location column. */
function locationTable(rows: Record<string, string>[]): ParsedTable {
  const headers = LOCATION_COLUMNS.map((c) => c.name);
  return {
    format: "csv",
    headers,
    rows: rows.map((r, i) => ({ line: i + 2, cells: Object.fromEntries(headers.map((h) => [h, r[h] ?? ""])) })),
  };
}

function issuesFor(rows: Record<string, string>[]): ImportIssue[] {
  return validateLocationRows(locationTable(rows), siteLookups).issues;
}

function onlyIssue(rows: Record<string, string>[]): ImportIssue {
  const issues = issuesFor(rows);
  expect(issues).toHaveLength(1);
  return issues[0];
}

describe("validating location rows", () => {
  it("gathers sites, rooms and units from rows that repeat the room", () => {
    const result = validateLocationRows(
      locationTable([
        { ...ROOM, ...CABINET },
        { site: "North Campus", room_code: "B-014", ...FRIDGE },
        { site: "South Campus", room_code: "L-2", room_name: "Teaching lab" },
      ]),
      siteLookups,
    );
    expect(result.issues).toEqual([]);
    expect(result.rowCount).toBe(3);
    expect(result.sites).toEqual([{ name: "North Campus", existingId: 1 }, { name: "South Campus" }]);
    expect(result.notices).toEqual([
      "Site “South Campus” is not in Headroom yet; the import will create it (first named on line 4).",
    ]);
    expect(result.rooms).toEqual([
      {
        line: 2,
        lines: [2, 3],
        siteName: "North Campus",
        code: "B-014",
        name: "Solvent store",
        kind: "storeroom",
        floorAreaM2: 18,
        heightM: 2.8,
        airChangesPerHour: 6,
        mixingFactor: 0.4,
        designMaxTempC: 30,
        sprinklered: true,
        setMinC: null,
        setMaxC: null,
        excursionThresholdC: null,
        excursionMinDurationMin: null,
        defaulted: [],
      },
      {
        line: 4,
        lines: [4],
        siteName: "South Campus",
        code: "L-2",
        name: "Teaching lab",
        kind: "laboratory",
        floorAreaM2: null,
        heightM: null,
        airChangesPerHour: null,
        mixingFactor: 0.5,
        designMaxTempC: null,
        sprinklered: false,
        setMinC: null,
        setMaxC: null,
        excursionThresholdC: null,
        excursionMinDurationMin: null,
        defaulted: ["kind", "mixingFactor", "sprinklered"],
      },
    ]);
    expect(result.units).toEqual([
      {
        line: 2,
        siteName: "North Campus",
        roomCode: "B-014",
        code: "FC-1",
        name: "Flammables cabinet 1",
        kind: "flammable_cabinet",
        internalVolumeL: 450,
        setMinC: null,
        setMaxC: null,
        excursionThresholdC: null,
        excursionMinDurationMin: null,
        ventilated: false,
        ignitionSourceFree: true,
        defaulted: [],
      },
      {
        line: 3,
        siteName: "North Campus",
        roomCode: "B-014",
        code: "FR-2",
        name: "Flammable-storage refrigerator",
        kind: "flammable_storage_refrigerator",
        internalVolumeL: 150,
        setMinC: 2,
        setMaxC: 8,
        excursionThresholdC: 10,
        excursionMinDurationMin: 30,
        ventilated: false,
        ignitionSourceFree: false,
        defaulted: ["ventilated", "ignitionSourceFree"],
      },
    ]);
  });

  it("treats site names that differ only in case or spacing as one site", () => {
    const result = validateLocationRows(
      locationTable([
        { ...ROOM, ...CABINET },
        { ...ROOM, site: "north  CAMPUS", ...FRIDGE },
      ]),
      siteLookups,
    );
    expect(result.issues).toEqual([]);
    expect(result.sites).toEqual([{ name: "North Campus", existingId: 1 }]);
    expect(result.rooms).toHaveLength(1);
  });

  it("reports room columns that disagree between rows, naming the earlier line", () => {
    expect(onlyIssue([{ ...ROOM, ...CABINET }, { ...ROOM, floor_area_m2: "24", ...FRIDGE }])).toEqual({
      line: 3,
      column: "floor_area_m2",
      value: "24",
      message:
        "Room B-014 at North Campus has floor_area_m2 18 on line 2, but 24 here. Every row of a room must agree on the room's columns.",
    });
    expect(onlyIssue([{ ...ROOM }, { ...ROOM, sprinklered: "no", ...FRIDGE }]).message).toBe(
      "Room B-014 at North Campus has sprinklered yes on line 2, but no here. Every row of a room must agree on the room's columns.",
    );
  });

  it("lets rows agree in different spellings and leave room columns empty", () => {
    expect(
      issuesFor([
        { ...ROOM, ...CABINET },
        { ...ROOM, floor_area_m2: "18.0", sprinklered: "TRUE", room_kind: "Storeroom", ...FRIDGE },
        { site: "North Campus", room_code: "B-014", unit_code: "SH-3", unit_name: "Shelf 3", unit_kind: "open shelving" },
      ]),
    ).toEqual([]);
  });

  it("reports values out of range, with the range", () => {
    const cases: [Record<string, string>, string, string][] = [
      [{ floor_area_m2: "0" }, "floor_area_m2", "Floor area must be more than 0 m²; got 0."],
      [{ height_m: "1.2" }, "height_m", "Room height must be between 1.5 m and 20 m; got 1.2."],
      [{ height_m: "28" }, "height_m", "Room height must be between 1.5 m and 20 m; got 28."],
      [{ air_changes_per_hour: "120" }, "air_changes_per_hour", "Air changes per hour must be between 0 and 100; got 120."],
      [{ mixing_factor: "0" }, "mixing_factor", "Mixing factor must be more than 0 and at most 1; got 0."],
      [{ mixing_factor: "1.2" }, "mixing_factor", "Mixing factor must be more than 0 and at most 1; got 1.2."],
      [{ design_max_temp_c: "150" }, "design_max_temp_c", "Design maximum temperature must be between −100 °C and 100 °C; got 150."],
      [{ set_min_c: "-120" }, "set_min_c", "Set minimum must be between −100 °C and 100 °C; got −120."],
      [{ internal_volume_l: "-3" }, "internal_volume_l", "Internal volume must be more than 0 L; got −3."],
      [{ excursion_min_duration_min: "2.5" }, "excursion_min_duration_min", "Excursion minimum duration must be a whole number; got 2.5."],
    ];
    for (const [change, column, message] of cases) {
      expect(onlyIssue([{ ...ROOM, ...CABINET, ...change }])).toEqual({ line: 2, column, value: Object.values(change)[0], message });
    }
  });

  it("reports a set range whose minimum is above its maximum", () => {
    expect(onlyIssue([{ ...ROOM, ...FRIDGE, set_min_c: "8", set_max_c: "2" }])).toEqual({
      line: 2,
      column: "set_max_c",
      value: "2",
      message: "The set range runs from 8 °C to 2 °C; the minimum must not be above the maximum.",
    });
    expect(
      onlyIssue([
        { ...ROOM, room_kind: "cold_room", room_set_min_c: "4" },
        { ...ROOM, room_kind: "cold_room", room_set_max_c: "-2" },
      ]),
    ).toEqual({
      line: 3,
      column: "room_set_max_c",
      value: "-2",
      message: "The set range of room B-014 runs from 4 °C to −2 °C; the minimum must not be above the maximum.",
    });
  });

  it("reports a yes/no column with another word", () => {
    expect(onlyIssue([{ ...ROOM, sprinklered: "partly" }])).toEqual({
      line: 2,
      column: "sprinklered",
      value: "partly",
      message: "Write yes or no; got “partly”.",
    });
  });

  it("reports unknown room and unit kinds", () => {
    expect(onlyIssue([{ ...ROOM, room_kind: "office" }]).message).toBe(
      "Unknown room kind “office”; use one of: storeroom, laboratory, cold_room, corridor, other.",
    );
    expect(onlyIssue([{ ...ROOM, ...CABINET, unit_kind: "safe" }]).message).toMatch(
      /^Unknown storage unit kind “safe”; use one of: open_shelving, flammable_cabinet, /,
    );
  });

  it("reports unit columns filled in without a unit code", () => {
    expect(onlyIssue([{ ...ROOM, unit_name: "Cabinet", internal_volume_l: "100" }])).toEqual({
      line: 2,
      column: "unit_code",
      value: "",
      message:
        "Unit columns are filled in (unit_name, internal_volume_l) but unit_code is empty. Give the unit's code, or clear the unit columns on a row that declares only the room.",
    });
  });

  it("reports a unit without a name or kind", () => {
    const issues = issuesFor([{ ...ROOM, unit_code: "FC-1" }]);
    expect(issues.map((i) => [i.line, i.column, i.message])).toEqual([
      [2, "unit_name", "Unit FC-1 has no name; fill in unit_name."],
      [2, "unit_kind", expect.stringMatching(/^Unit FC-1 has no kind; use one of: open_shelving, /)],
    ]);
  });

  it("reports a unit given twice, naming the first line", () => {
    const result = validateLocationRows(locationTable([{ ...ROOM, ...CABINET }, { ...ROOM, ...CABINET }]), siteLookups);
    expect(result.issues).toEqual([
      {
        line: 3,
        column: "unit_code",
        value: "FC-1",
        message: "Storage unit FC-1 in room B-014 at North Campus is already on line 2; give each unit one row.",
      },
    ]);
    expect(result.units.map((u) => u.line)).toEqual([2]);
  });

  it("reports room and unit codes that differ only in capital letters", () => {
    const issues = issuesFor([
      { ...ROOM, ...CABINET },
      { ...ROOM, room_code: "b-014" },
      { ...ROOM, ...FRIDGE },
      { ...ROOM, ...FRIDGE, unit_code: "fr-2" },
    ]);
    expect(issues).toEqual([
      {
        line: 3,
        column: "room_code",
        value: "b-014",
        message:
          "Room code b-014 differs from B-014 on line 2 only in capital letters. Write the same code the same way each time, or choose clearly different codes.",
      },
      {
        line: 5,
        column: "unit_code",
        value: "fr-2",
        message:
          "Unit code fr-2 differs from FR-2 on line 4 only in capital letters. Write the same code the same way each time, or choose clearly different codes.",
      },
    ]);
  });

  it("checks a large file quickly", () => {
    const rows = Array.from({ length: 20_000 }, (_, i) => ({
      ...ROOM,
      room_code: `R-${Math.floor(i / 10)}`,
      ...CABINET,
      unit_code: `U-${i % 10}`,
    }));
    const started = performance.now();
    const result = validateLocationRows(locationTable(rows), siteLookups);
    expect(result.issues).toEqual([]);
    expect(result.rooms).toHaveLength(2000);
    expect(result.units).toHaveLength(20_000);
    expect(performance.now() - started).toBeLessThan(3000);
  });

  it("reports a room that has no name on any row", () => {
    expect(onlyIssue([{ site: "North Campus", room_code: "B-020", ...CABINET }])).toEqual({
      line: 2,
      column: "room_name",
      value: "",
      message: "Room B-020 at North Campus has no name on any of its rows; fill in room_name.",
    });
  });

  it("reports a missing site and room code", () => {
    const issues = issuesFor([{ ...ROOM, site: "", room_code: "" }]);
    expect(issues.map((i) => i.column)).toEqual(["site", "room_code"]);
  });

  it("keeps rooms and units with a problem out of the results", () => {
    const result = validateLocationRows(
      locationTable([{ ...ROOM, ...CABINET }, { ...ROOM, ...FRIDGE, set_max_c: "hot" }]),
      siteLookups,
    );
    expect(result.issues.map((i) => [i.line, i.column])).toEqual([[3, "set_max_c"]]);
    expect(result.rooms).toEqual([]);
    expect(result.units.map((u) => u.code)).toEqual(["FC-1"]);
  });
});
