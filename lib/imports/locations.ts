/**
 * Sites, rooms and storage units from a spreadsheet: one row per storage unit, with its room and
 * site repeated on every row. A row with the unit columns empty declares a room without units.
 */
import { ROOM_KINDS, STORAGE_UNIT_KINDS, type RoomKind, type StorageUnitKind } from "@/db/schema";
import { checkColumns, IssueList, reportExtraCells, type ImportColumn, type ImportIssue } from "./columns";
import type { ParsedRow, ParsedTable } from "./parse";
import {
  collapseSpaces,
  readChoice,
  readNumberInRange,
  readYesNo,
  showNumber,
  type NumberRange,
  type Read,
} from "./values";

export const NAME_MAX_LENGTH = 200;
export const CODE_MAX_LENGTH = 50;
export const DEFAULT_ROOM_KIND: RoomKind = "laboratory";
export const DEFAULT_MIXING_FACTOR = 0.5;

const TEMP_RANGE = { unit: "°C", min: -100, max: 100 } as const;
const RANGES = {
  floorAreaM2: { label: "Floor area", unit: "m²", min: 0, minExclusive: true },
  heightM: { label: "Room height", unit: "m", min: 1.5, max: 20 },
  airChangesPerHour: { label: "Air changes per hour", unit: "", min: 0, max: 100 },
  mixingFactor: { label: "Mixing factor", unit: "", min: 0, max: 1, minExclusive: true },
  designMaxTempC: { label: "Design maximum temperature", ...TEMP_RANGE },
  setMinC: { label: "Set minimum", ...TEMP_RANGE },
  setMaxC: { label: "Set maximum", ...TEMP_RANGE },
  excursionThresholdC: { label: "Excursion threshold", ...TEMP_RANGE },
  excursionMinDurationMin: { label: "Excursion minimum duration", unit: "min", min: 0, integer: true },
  internalVolumeL: { label: "Internal volume", unit: "L", min: 0, minExclusive: true },
} satisfies Record<string, NumberRange>;

export const LOCATION_COLUMNS = [
  { name: "site", required: true, description: "Site name. A site not yet in Headroom is created.", example: "North Campus", type: "text" },
  { name: "room_code", required: true, description: "Room code, unique within the site.", example: "B-014", type: "text" },
  {
    name: "room_name",
    required: true,
    description: "Room name; needed on at least one row of each room.",
    example: "Solvent store",
    type: "text",
  },
  {
    name: "room_kind",
    required: false,
    description: `Kind of room; empty means ${DEFAULT_ROOM_KIND}.`,
    example: "storeroom",
    type: "choice",
    choices: ROOM_KINDS,
  },
  { name: "floor_area_m2", required: false, description: "Floor area in m², more than 0.", example: "18", type: "number" },
  { name: "height_m", required: false, description: "Clear room height in m, 1.5 to 20.", example: "2.8", type: "number" },
  {
    name: "air_changes_per_hour",
    required: false,
    description: "Mechanical ventilation rate in air changes per hour, 0 to 100.",
    example: "6",
    type: "number",
  },
  {
    name: "mixing_factor",
    required: false,
    description: `Well-mixed room mixing factor, more than 0 and at most 1; empty means ${DEFAULT_MIXING_FACTOR}.`,
    example: "0.5",
    type: "number",
  },
  {
    name: "design_max_temp_c",
    required: false,
    description: "Highest temperature the room is designed to reach, in °C.",
    example: "30",
    type: "number",
  },
  { name: "sprinklered", required: false, description: "Whether the room has sprinklers: yes or no.", example: "yes", type: "yes_no" },
  {
    name: "room_set_min_c",
    required: false,
    description: "For a walk-in cold room: lowest temperature of its set range, in °C.",
    example: "",
    type: "number",
  },
  {
    name: "room_set_max_c",
    required: false,
    description: "For a walk-in cold room: highest temperature of its set range, in °C.",
    example: "",
    type: "number",
  },
  {
    name: "room_excursion_threshold_c",
    required: false,
    description: "For a walk-in cold room: temperature above which an excursion starts, in °C.",
    example: "",
    type: "number",
  },
  {
    name: "room_excursion_min_duration_min",
    required: false,
    description: "For a walk-in cold room: minutes above the threshold before it counts as an excursion.",
    example: "",
    type: "number",
  },
  {
    name: "unit_code",
    required: false,
    description: "Storage unit code, unique within the room. Leave the unit columns empty to declare a room only.",
    example: "FC-1",
    type: "text",
  },
  { name: "unit_name", required: false, description: "Storage unit name; needed when unit_code is given.", example: "Flammables cabinet 1", type: "text" },
  {
    name: "unit_kind",
    required: false,
    description: "Kind of storage unit; needed when unit_code is given.",
    example: "flammable_cabinet",
    type: "choice",
    choices: STORAGE_UNIT_KINDS,
  },
  { name: "internal_volume_l", required: false, description: "Internal volume of the unit in L, more than 0.", example: "450", type: "number" },
  { name: "set_min_c", required: false, description: "Lowest temperature of the unit's set range, in °C.", example: "", type: "number" },
  { name: "set_max_c", required: false, description: "Highest temperature of the unit's set range, in °C.", example: "", type: "number" },
  {
    name: "excursion_threshold_c",
    required: false,
    description: "Temperature above which the unit is in an excursion, in °C.",
    example: "",
    type: "number",
  },
  {
    name: "excursion_min_duration_min",
    required: false,
    description: "Minutes above the threshold before it counts as an excursion; a whole number.",
    example: "",
    type: "number",
  },
  { name: "ventilated", required: false, description: "Whether the unit is ventilated: yes or no; empty means no.", example: "no", type: "yes_no" },
  {
    name: "ignition_source_free",
    required: false,
    description: "Whether the unit's interior is free of ignition sources: yes or no; empty means no.",
    example: "yes",
    type: "yes_no",
  },
] as const satisfies readonly ImportColumn[];

export type LocationLookups = {
  siteIdByName(name: string): number | undefined;
};

export type ValidSite = { name: string; existingId?: number };

export type ValidRoom = {
  /** First line the room appears on, and every line it appears on. */
  line: number;
  lines: number[];
  siteName: string;
  code: string;
  name: string;
  kind: RoomKind;
  floorAreaM2: number | null;
  heightM: number | null;
  airChangesPerHour: number | null;
  mixingFactor: number;
  designMaxTempC: number | null;
  sprinklered: boolean;
  setMinC: number | null;
  setMaxC: number | null;
  excursionThresholdC: number | null;
  excursionMinDurationMin: number | null;
  /** Fields no row filled in, so they hold the default; an update of an existing room should keep its own. */
  defaulted: ("kind" | "mixingFactor" | "sprinklered")[];
};

export type ValidUnit = {
  line: number;
  siteName: string;
  roomCode: string;
  code: string;
  name: string;
  kind: StorageUnitKind;
  internalVolumeL: number | null;
  setMinC: number | null;
  setMaxC: number | null;
  excursionThresholdC: number | null;
  excursionMinDurationMin: number | null;
  ventilated: boolean;
  ignitionSourceFree: boolean;
  defaulted: ("ventilated" | "ignitionSourceFree")[];
};

export type LocationValidation = {
  sites: ValidSite[];
  /** Rooms and units whose rows have no issue. Write only when `issues` is empty. */
  rooms: ValidRoom[];
  units: ValidUnit[];
  issues: ImportIssue[];
  rowCount: number;
  /** New sites to be created, ignored columns. */
  notices: string[];
};

// ---------------------------------------------------------------------------------------------
// Field readers
// ---------------------------------------------------------------------------------------------

type FieldValue = string | number | boolean;
type RoomField = { column: string; key: string; read: (raw: string) => Read<FieldValue> };

function readName(what: string) {
  return (raw: string): Read<string> => {
    const name = collapseSpaces(raw);
    if (name.length > NAME_MAX_LENGTH) {
      return { ok: false, message: `${what} is ${name.length} characters long; the most is ${NAME_MAX_LENGTH}.` };
    }
    return { ok: true, value: name };
  };
}

const ranged = (range: NumberRange) => (raw: string) => readNumberInRange(raw, range);

const ROOM_FIELDS: RoomField[] = [
  { column: "room_name", key: "name", read: readName("Room name") },
  { column: "room_kind", key: "kind", read: (raw) => readChoice(raw, ROOM_KINDS, "room kind") },
  { column: "floor_area_m2", key: "floorAreaM2", read: ranged(RANGES.floorAreaM2) },
  { column: "height_m", key: "heightM", read: ranged(RANGES.heightM) },
  { column: "air_changes_per_hour", key: "airChangesPerHour", read: ranged(RANGES.airChangesPerHour) },
  { column: "mixing_factor", key: "mixingFactor", read: ranged(RANGES.mixingFactor) },
  { column: "design_max_temp_c", key: "designMaxTempC", read: ranged(RANGES.designMaxTempC) },
  { column: "sprinklered", key: "sprinklered", read: readYesNo },
  { column: "room_set_min_c", key: "setMinC", read: ranged(RANGES.setMinC) },
  { column: "room_set_max_c", key: "setMaxC", read: ranged(RANGES.setMaxC) },
  { column: "room_excursion_threshold_c", key: "excursionThresholdC", read: ranged(RANGES.excursionThresholdC) },
  {
    column: "room_excursion_min_duration_min",
    key: "excursionMinDurationMin",
    read: ranged(RANGES.excursionMinDurationMin),
  },
];

const UNIT_COLUMNS = [
  "unit_code",
  "unit_name",
  "unit_kind",
  "internal_volume_l",
  "set_min_c",
  "set_max_c",
  "excursion_threshold_c",
  "excursion_min_duration_min",
  "ventilated",
  "ignition_source_free",
] as const;

function showValue(value: FieldValue): string {
  if (typeof value === "boolean") return value ? "yes" : "no";
  if (typeof value === "number") return showNumber(value);
  return `“${value}”`;
}

// ---------------------------------------------------------------------------------------------
// Validation
// ---------------------------------------------------------------------------------------------

type RoomDraft = {
  siteName: string;
  code: string;
  lines: number[];
  /** Value of each room field and the line that set it. */
  fields: Map<string, { value: FieldValue; line: number; row: ParsedRow }>;
  firstRow: ParsedRow;
};

export function validateLocationRows(table: ParsedTable, lookups: LocationLookups): LocationValidation {
  const notices = checkColumns(table, LOCATION_COLUMNS, { required: ["site", "room_code", "room_name"] }, "location");
  const issues = new IssueList();
  /** Site names compare without regard to case or repeated spaces; the first spelling is kept. */
  const sites = new Map<string, { name: string; line: number }>();
  const rooms = new Map<string, RoomDraft>();
  const units: ValidUnit[] = [];
  const unitLines = new Map<string, number>();
  const roomsByFoldedCode = new Map<string, RoomDraft>();
  const unitsByFoldedCode = new Map<string, ValidUnit>();

  for (const row of table.rows) {
    reportExtraCells(table, row, issues);
    const cell = (column: string) => row.cells[column] ?? "";

    const siteText = collapseSpaces(cell("site"));
    const code = cell("room_code");
    if (siteText === "") issues.add(row, "site", "Site is missing; give the name of the site the room is on.");
    if (code === "") issues.add(row, "room_code", "Room code is missing; every row needs the code of its room.");
    else if (code.length > CODE_MAX_LENGTH) {
      issues.add(row, "room_code", `Room code is ${code.length} characters long; the most is ${CODE_MAX_LENGTH}.`);
    }

    let room: RoomDraft | undefined;
    if (siteText !== "" && code !== "") {
      const siteKey = siteText.toLowerCase();
      if (!sites.has(siteKey)) sites.set(siteKey, { name: siteText, line: row.line });
      const siteName = sites.get(siteKey)!.name;
      const roomKey = `${siteKey}\u0000${code}`;
      room = rooms.get(roomKey);
      if (!room) {
        const foldedKey = `${siteKey}\u0000${code.toLowerCase()}`;
        const twin = roomsByFoldedCode.get(foldedKey);
        if (twin) issues.add(row, "room_code", capitalsOnly("Room code", code, twin.code, twin.lines[0]));
        room = { siteName, code, lines: [], fields: new Map(), firstRow: row };
        rooms.set(roomKey, room);
        if (!twin) roomsByFoldedCode.set(foldedKey, room);
      }
      room.lines.push(row.line);
    }

    for (const field of ROOM_FIELDS) {
      const raw = cell(field.column);
      if (raw === "") continue;
      const read = field.read(raw);
      if (!read.ok) {
        issues.add(row, field.column, read.message);
        continue;
      }
      if (!room) continue;
      const earlier = room.fields.get(field.key);
      if (!earlier) room.fields.set(field.key, { value: read.value, line: row.line, row });
      else if (earlier.value !== read.value) {
        issues.add(
          row,
          field.column,
          `Room ${room.code} at ${room.siteName} has ${field.column} ${showValue(earlier.value)} on line ${earlier.line}, ` +
            `but ${showValue(read.value)} here. Every row of a room must agree on the room's columns.`,
        );
      }
    }

    const unit = validateUnit(row, room, issues);
    if (unit && room) {
      const unitKey = `${room.siteName.toLowerCase()}\u0000${room.code}\u0000${unit.code}`;
      const first = unitLines.get(unitKey);
      const foldedKey = `${room.siteName.toLowerCase()}\u0000${room.code}\u0000${unit.code.toLowerCase()}`;
      const twin = unitsByFoldedCode.get(foldedKey);
      if (twin && twin.code !== unit.code) {
        issues.add(row, "unit_code", capitalsOnly("Unit code", unit.code, twin.code, twin.line));
      }
      if (!twin) unitsByFoldedCode.set(foldedKey, unit);
      if (first !== undefined) {
        issues.add(
          row,
          "unit_code",
          `Storage unit ${unit.code} in room ${room.code} at ${room.siteName} is already on line ${first}; ` +
            "give each unit one row.",
        );
      } else {
        unitLines.set(unitKey, row.line);
        units.push(unit);
      }
    }
  }

  const validRooms: ValidRoom[] = [];
  for (const room of rooms.values()) {
    const value = <T extends FieldValue>(key: string): T | undefined => room.fields.get(key)?.value as T | undefined;
    const name = value<string>("name");
    if (name === undefined) {
      issues.add(
        room.firstRow,
        "room_name",
        `Room ${room.code} at ${room.siteName} has no name on any of its rows; fill in room_name.`,
      );
    }
    const setMinC = value<number>("setMinC");
    const setMaxC = value<number>("setMaxC");
    if (setMinC !== undefined && setMaxC !== undefined && setMinC > setMaxC) {
      issues.add(
        room.fields.get("setMaxC")!.row,
        "room_set_max_c",
        `The set range of room ${room.code} runs from ${showNumber(setMinC)} °C to ${showNumber(setMaxC)} °C; ` +
          "the minimum must not be above the maximum.",
      );
    }
    if (name === undefined || room.lines.some((line) => issues.has(line))) continue;
    const kind = value<RoomKind>("kind");
    const mixingFactor = value<number>("mixingFactor");
    const sprinklered = value<boolean>("sprinklered");
    const defaulted: ValidRoom["defaulted"] = [];
    if (kind === undefined) defaulted.push("kind");
    if (mixingFactor === undefined) defaulted.push("mixingFactor");
    if (sprinklered === undefined) defaulted.push("sprinklered");
    validRooms.push({
      line: room.lines[0],
      lines: room.lines,
      siteName: room.siteName,
      code: room.code,
      name,
      kind: kind ?? DEFAULT_ROOM_KIND,
      floorAreaM2: value<number>("floorAreaM2") ?? null,
      heightM: value<number>("heightM") ?? null,
      airChangesPerHour: value<number>("airChangesPerHour") ?? null,
      mixingFactor: mixingFactor ?? DEFAULT_MIXING_FACTOR,
      designMaxTempC: value<number>("designMaxTempC") ?? null,
      sprinklered: sprinklered ?? false,
      setMinC: setMinC ?? null,
      setMaxC: setMaxC ?? null,
      excursionThresholdC: value<number>("excursionThresholdC") ?? null,
      excursionMinDurationMin: value<number>("excursionMinDurationMin") ?? null,
      defaulted,
    });
  }

  const validSites: ValidSite[] = [];
  for (const { name, line } of sites.values()) {
    const existingId = lookups.siteIdByName(name);
    if (existingId === undefined) {
      validSites.push({ name });
      notices.push(`Site “${name}” is not in Headroom yet; the import will create it (first named on line ${line}).`);
    } else validSites.push({ name, existingId });
  }

  const items = [...issues.items].sort((a, b) => a.line - b.line);
  return {
    sites: validSites,
    rooms: validRooms,
    units: units.filter((u) => !issues.has(u.line)),
    issues: items,
    rowCount: table.rows.length,
    notices,
  };
}

/** Codes are kept exactly as written, so two spellings would make two rooms or units. */
function capitalsOnly(what: string, code: string, earlier: string, line: number): string {
  return (
    `${what} ${code} differs from ${earlier} on line ${line} only in capital letters. ` +
    "Write the same code the same way each time, or choose clearly different codes."
  );
}

function validateUnit(row: ParsedRow, room: RoomDraft | undefined, issues: IssueList): ValidUnit | undefined {
  const cell = (column: string) => row.cells[column] ?? "";
  const code = cell("unit_code");
  if (code === "") {
    const filled = UNIT_COLUMNS.filter((c) => cell(c) !== "");
    if (filled.length > 0) {
      issues.add(
        row,
        "unit_code",
        `Unit columns are filled in (${filled.join(", ")}) but unit_code is empty. Give the unit's code, ` +
          "or clear the unit columns on a row that declares only the room.",
      );
    }
    return undefined;
  }
  let complete = true;
  const report = (column: string, message: string) => {
    issues.add(row, column, message);
    complete = false;
  };
  const take = <T>(column: string, read: Read<T>): T | undefined => {
    if (read.ok) return read.value;
    report(column, read.message);
    return undefined;
  };
  const optional = (column: string, range: NumberRange): number | null =>
    cell(column) === "" ? null : (take(column, readNumberInRange(cell(column), range)) ?? null);

  if (code.length > CODE_MAX_LENGTH) report("unit_code", `Unit code is ${code.length} characters long; the most is ${CODE_MAX_LENGTH}.`);
  const name = cell("unit_name") === "" ? undefined : take("unit_name", readName("Unit name")(cell("unit_name")));
  if (cell("unit_name") === "") report("unit_name", `Unit ${code} has no name; fill in unit_name.`);
  const kind =
    cell("unit_kind") === ""
      ? undefined
      : take("unit_kind", readChoice(cell("unit_kind"), STORAGE_UNIT_KINDS, "storage unit kind"));
  if (cell("unit_kind") === "") {
    report("unit_kind", `Unit ${code} has no kind; use one of: ${STORAGE_UNIT_KINDS.join(", ")}.`);
  }
  const internalVolumeL = optional("internal_volume_l", RANGES.internalVolumeL);
  const setMinC = optional("set_min_c", RANGES.setMinC);
  const setMaxC = optional("set_max_c", RANGES.setMaxC);
  if (setMinC !== null && setMaxC !== null && setMinC > setMaxC) {
    report(
      "set_max_c",
      `The set range runs from ${showNumber(setMinC)} °C to ${showNumber(setMaxC)} °C; ` +
        "the minimum must not be above the maximum.",
    );
  }
  const excursionThresholdC = optional("excursion_threshold_c", RANGES.excursionThresholdC);
  const excursionMinDurationMin = optional("excursion_min_duration_min", RANGES.excursionMinDurationMin);
  const ventilated = cell("ventilated") === "" ? null : (take("ventilated", readYesNo(cell("ventilated"))) ?? null);
  const ignitionSourceFree =
    cell("ignition_source_free") === ""
      ? null
      : (take("ignition_source_free", readYesNo(cell("ignition_source_free"))) ?? null);

  if (!complete || !room || name === undefined || kind === undefined) return undefined;
  const defaulted: ValidUnit["defaulted"] = [];
  if (ventilated === null) defaulted.push("ventilated");
  if (ignitionSourceFree === null) defaulted.push("ignitionSourceFree");
  return {
    line: row.line,
    siteName: room.siteName,
    roomCode: room.code,
    code,
    name,
    kind,
    internalVolumeL,
    setMinC,
    setMaxC,
    excursionThresholdC,
    excursionMinDurationMin,
    ventilated: ventilated ?? false,
    ignitionSourceFree: ignitionSourceFree ?? false,
    defaulted,
  };
}
