/** Containers from a spreadsheet: one row per container, keyed by its label. */
import { AMOUNT_UNITS, CONTAINER_KINDS, CONTAINER_STATES, type AmountUnit, type ContainerState } from "@/db/schema";
import { checkColumns, IssueList, reportExtraCells, type ImportColumn, type ImportIssue } from "./columns";
import type { ParsedRow, ParsedTable } from "./parse";
import {
  collapseSpaces,
  readCas,
  readChoice,
  readDate,
  readEmail,
  readNumber,
  showNumber,
  type Read,
} from "./values";

export type ContainerKind = (typeof CONTAINER_KINDS)[number];

export const LABEL_MAX_LENGTH = 100;
export const NOTES_MAX_LENGTH = 2000;
export const DEFAULT_CONTAINER_KIND: ContainerKind = "glass_bottle";
export const DEFAULT_CONTAINER_STATE: ContainerState = "sealed";

export const CONTAINER_COLUMNS = [
  {
    name: "label",
    required: true,
    description:
      "The label or barcode on the container, unique across Headroom. Importing a label that already exists updates that container.",
    example: "HR-000123",
    type: "text",
  },
  {
    name: "cas",
    required: false,
    description: "CAS number of the substance, e.g. 64-17-5. Give exactly one of cas, substance or mixture.",
    example: "64-17-5",
    type: "text",
  },
  {
    name: "substance",
    required: false,
    description: "Substance name or synonym as in the substance library (case does not matter), if no CAS number is given.",
    example: "Ethanol",
    type: "text",
  },
  {
    name: "mixture",
    required: false,
    description: "Name of a mixture already set up in Headroom, for containers that hold a mixture.",
    example: "Solvent waste (halogen-free)",
    type: "text",
  },
  {
    name: "amount",
    required: true,
    description: "Amount in the container now, zero or more, with a dot as the decimal mark.",
    example: "2.5",
    type: "number",
  },
  {
    name: "amount_unit",
    required: true,
    description: "Unit of the amount: mL, L, g or kg (words such as litre or grams are understood).",
    example: "L",
    type: "choice",
    choices: AMOUNT_UNITS,
  },
  {
    name: "capacity",
    required: false,
    description: "Nominal capacity of the container; not smaller than the amount.",
    example: "2.5",
    type: "number",
  },
  {
    name: "capacity_unit",
    required: false,
    description: "Unit of the capacity (mL, L, g or kg); needed when a capacity is given.",
    example: "L",
    type: "choice",
    choices: AMOUNT_UNITS,
  },
  {
    name: "container_kind",
    required: false,
    description: `What the container is; empty means ${DEFAULT_CONTAINER_KIND}.`,
    example: "glass_bottle",
    type: "choice",
    choices: CONTAINER_KINDS,
  },
  {
    name: "state",
    required: false,
    description: `State of the container; empty means ${DEFAULT_CONTAINER_STATE}.`,
    example: "sealed",
    type: "choice",
    choices: CONTAINER_STATES,
  },
  {
    name: "site",
    required: true,
    description: "Name of the site where the container is stored.",
    example: "North Campus",
    type: "text",
  },
  { name: "room", required: true, description: "Code of the room within the site.", example: "B-014", type: "text" },
  {
    name: "storage_unit",
    required: true,
    description: "Code of the storage unit (cabinet, refrigerator, shelf…) within the room.",
    example: "FC-1",
    type: "text",
  },
  {
    name: "owner_email",
    required: false,
    description: "E-mail address of the Headroom user responsible for the container.",
    example: "r.okafor@example.org",
    type: "email",
  },
  {
    name: "received_on",
    required: false,
    description: "Date received, as YYYY-MM-DD.",
    example: "2026-01-12",
    type: "date",
  },
  {
    name: "opened_on",
    required: false,
    description: "Date first opened, as YYYY-MM-DD; not before the date received.",
    example: "",
    type: "date",
  },
  {
    name: "expires_on",
    required: false,
    description: "Expiry or re-test date, as YYYY-MM-DD.",
    example: "2028-01-31",
    type: "date",
  },
  { name: "notes", required: false, description: "Free text.", example: "", type: "text" },
] as const satisfies readonly ImportColumn[];

const CONTENT_COLUMNS = ["cas", "substance", "mixture"] as const;

export type ContainerLookups = {
  substanceIdByCas(cas: string): number | undefined;
  /** Case-insensitive, over names and synonyms. */
  substanceIdByName(name: string): number | undefined;
  mixtureIdByName(name: string): number | undefined;
  storageUnitId(site: string, roomCode: string, unitCode: string): number | undefined;
  /** Receives the address trimmed and in lower case. */
  userIdByEmail(email: string): number | undefined;
  /** Optional: lets a message say that the site, rather than the unit, is unknown. */
  siteIdByName?(name: string): number | undefined;
  /** Optional: lets a message say that the room, rather than the unit, is unknown. */
  roomIdByCode?(site: string, roomCode: string): number | undefined;
};

export type ValidContainerRow = {
  line: number;
  label: string;
  substanceId: number | null;
  mixtureId: number | null;
  amount: number;
  amountUnit: AmountUnit;
  capacity: number | null;
  capacityUnit: AmountUnit | null;
  containerKind: ContainerKind;
  state: ContainerState;
  storageUnitId: number;
  ownerId: number | null;
  /** Calendar dates as UTC midnight, epoch milliseconds. */
  receivedAt: number | null;
  openedAt: number | null;
  expiresAt: number | null;
  notes: string | null;
  /** Fields the row left empty, so they hold the default; an update of an existing container should keep its own. */
  defaulted: ("containerKind" | "state")[];
};

export type ContainerValidation = {
  /** Rows without any issue, ready to write. Write only when `issues` is empty. */
  rows: ValidContainerRow[];
  issues: ImportIssue[];
  /** Data rows in the file (blank rows not counted). */
  rowCount: number;
  /** Things worth knowing that do not stop the import, e.g. ignored columns. */
  notices: string[];
};

// ---------------------------------------------------------------------------------------------
// Units
// ---------------------------------------------------------------------------------------------

const UNIT_WORDS: Record<string, AmountUnit> = {
  ml: "mL",
  millilitre: "mL",
  millilitres: "mL",
  milliliter: "mL",
  milliliters: "mL",
  l: "L",
  litre: "L",
  litres: "L",
  liter: "L",
  liters: "L",
  g: "g",
  gram: "g",
  grams: "g",
  gramme: "g",
  grammes: "g",
  kg: "kg",
  kilogram: "kg",
  kilograms: "kg",
  kilogramme: "kg",
  kilogrammes: "kg",
};

export function readAmountUnit(raw: string): Read<AmountUnit> {
  const unit = UNIT_WORDS[raw.trim().toLowerCase()];
  if (unit) return { ok: true, value: unit };
  return { ok: false, message: `Unknown unit “${raw}”; use mL, L, g or kg.` };
}

/** Volume units convert to mL, mass units to g; the two never compare. */
const UNIT_SCALE: Record<AmountUnit, { dimension: "volume" | "mass"; factor: number }> = {
  mL: { dimension: "volume", factor: 1 },
  L: { dimension: "volume", factor: 1000 },
  g: { dimension: "mass", factor: 1 },
  kg: { dimension: "mass", factor: 1000 },
};

// ---------------------------------------------------------------------------------------------
// Validation
// ---------------------------------------------------------------------------------------------

export function validateContainerRows(table: ParsedTable, lookups: ContainerLookups): ContainerValidation {
  const notices = checkColumns(
    table,
    CONTAINER_COLUMNS,
    {
      required: ["label", "amount", "amount_unit", "site", "room", "storage_unit"],
      anyOf: [{ columns: CONTENT_COLUMNS, label: "one of cas, substance or mixture" }],
    },
    "container",
  );
  const issues = new IssueList();
  const firstLineByLabel = new Map<string, number>();
  const rows: ValidContainerRow[] = [];
  for (const row of table.rows) {
    reportExtraCells(table, row, issues);
    const valid = validateContainerRow(row, table.headers, lookups, issues, firstLineByLabel);
    if (valid && !issues.has(row.line)) rows.push(valid);
  }
  return { rows, issues: issues.items, rowCount: table.rows.length, notices };
}

function validateContainerRow(
  row: ParsedRow,
  headers: string[],
  lookups: ContainerLookups,
  issues: IssueList,
  firstLineByLabel: Map<string, number>,
): ValidContainerRow | undefined {
  const cell = (column: string) => row.cells[column] ?? "";
  let complete = true;
  const report = (column: string, message: string) => {
    issues.add(row, column, message);
    complete = false;
  };
  /** Reads a non-empty cell; on failure reports and returns undefined. */
  const take = <T>(column: string, read: Read<T>): T | undefined => {
    if (read.ok) return read.value;
    report(column, read.message);
    return undefined;
  };

  // Label
  const label = cell("label");
  if (label === "") report("label", "Label is missing: every container needs its label or barcode.");
  else if (label.length > LABEL_MAX_LENGTH) {
    report("label", `Label is ${label.length} characters long; the most is ${LABEL_MAX_LENGTH}.`);
  } else {
    const first = firstLineByLabel.get(label);
    if (first !== undefined) {
      report("label", `Label ${label} is already used on line ${first}; each container needs its own label.`);
    } else firstLineByLabel.set(label, row.line);
  }

  // Content: exactly one of cas, substance, mixture
  const given = CONTENT_COLUMNS.filter((c) => cell(c) !== "");
  if (given.length === 0) {
    const column = CONTENT_COLUMNS.find((c) => headers.includes(c)) ?? "cas";
    report(column, "Say what the container holds: fill in one of cas, substance or mixture.");
  } else if (given.length > 1) {
    const listed = given.map((c) => `${c} “${cell(c)}”`).join(" and ");
    report(given[1], `Give only one of cas, substance or mixture; this row has ${listed}.`);
  }
  let substanceId: number | null = null;
  let mixtureId: number | null = null;
  if (cell("cas") !== "") {
    const cas = take("cas", readCas(cell("cas")));
    if (cas !== undefined) {
      const id = lookups.substanceIdByCas(cas);
      if (id === undefined) {
        report(
          "cas",
          `CAS number ${cas} is not in the substance library. Add the substance first, or check the number.`,
        );
      } else substanceId = id;
    }
  }
  if (cell("substance") !== "") {
    const name = collapseSpaces(cell("substance"));
    const id = lookups.substanceIdByName(name);
    if (id === undefined) {
      report(
        "substance",
        `No substance named “${name}” in the library (names and synonyms are searched). ` +
          "Check the spelling, give its CAS number instead, or add the substance first.",
      );
    } else substanceId = id;
  }
  if (cell("mixture") !== "") {
    const name = collapseSpaces(cell("mixture"));
    const id = lookups.mixtureIdByName(name);
    if (id === undefined) {
      report("mixture", `No mixture named “${name}”. Set the mixture up in Headroom first, or check the spelling.`);
    } else mixtureId = id;
  }

  // Amount and capacity
  let amount: number | undefined;
  if (cell("amount") === "") report("amount", "Amount is missing; give the amount in the container now (0 if empty).");
  else {
    amount = take("amount", readNumber(cell("amount")));
    if (amount !== undefined && amount < 0) {
      report("amount", `Amount must be zero or more; got ${showNumber(amount)}.`);
      amount = undefined;
    }
  }
  let amountUnit: AmountUnit | undefined;
  if (cell("amount_unit") === "") report("amount_unit", "Amount unit is missing; use mL, L, g or kg.");
  else amountUnit = take("amount_unit", readAmountUnit(cell("amount_unit")));

  let capacity: number | null = null;
  let capacityUnit: AmountUnit | null = null;
  if (cell("capacity") !== "") {
    const value = take("capacity", readNumber(cell("capacity")));
    if (value !== undefined && value <= 0) report("capacity", `Capacity must be more than zero; got ${showNumber(value)}.`);
    else if (value !== undefined) capacity = value;
    if (cell("capacity_unit") === "") {
      report("capacity_unit", "Capacity unit is missing; give the unit of the capacity (mL, L, g or kg).");
    }
  } else if (cell("capacity_unit") !== "") {
    report("capacity", `A capacity unit (“${cell("capacity_unit")}”) is given but no capacity; fill in both or neither.`);
  }
  if (cell("capacity_unit") !== "") {
    capacityUnit = take("capacity_unit", readAmountUnit(cell("capacity_unit"))) ?? null;
  }
  if (amount !== undefined && amountUnit && capacity !== null && capacityUnit) {
    const a = UNIT_SCALE[amountUnit];
    const c = UNIT_SCALE[capacityUnit];
    if (a.dimension === c.dimension && capacity * c.factor < amount * a.factor) {
      report(
        "capacity",
        `Capacity ${showNumber(capacity)} ${capacityUnit} is smaller than the amount ` +
          `${showNumber(amount)} ${amountUnit}; check both values and their units.`,
      );
    }
  }

  // Kind and state
  const containerKind =
    cell("container_kind") === ""
      ? DEFAULT_CONTAINER_KIND
      : take("container_kind", readChoice(cell("container_kind"), CONTAINER_KINDS, "container kind"));
  const state =
    cell("state") === ""
      ? DEFAULT_CONTAINER_STATE
      : take("state", readChoice(cell("state"), CONTAINER_STATES, "state"));

  // Location
  const site = collapseSpaces(cell("site"));
  const room = cell("room");
  const unit = cell("storage_unit");
  if (site === "") report("site", "Site is missing; give the name of the site where the container is stored.");
  if (room === "") report("room", "Room is missing; give the room code.");
  if (unit === "") report("storage_unit", "Storage unit is missing; give the code of the cabinet, refrigerator or shelf.");
  let storageUnitId: number | undefined;
  if (site !== "" && room !== "" && unit !== "") {
    storageUnitId = lookups.storageUnitId(site, room, unit);
    if (storageUnitId === undefined) {
      if (lookups.siteIdByName && lookups.siteIdByName(site) === undefined) {
        report("site", `No site named “${site}”. Check the spelling, or import the locations first.`);
      } else if (lookups.roomIdByCode && lookups.roomIdByCode(site, room) === undefined) {
        report("room", `No room ${room} at ${site}. Check the room code, or import the locations first.`);
      } else if (lookups.siteIdByName && lookups.roomIdByCode) {
        report("storage_unit", `No storage unit ${unit} in room ${room} at ${site}. Check the unit code.`);
      } else {
        report(
          "storage_unit",
          `No storage unit ${unit} in room ${room} at ${site}; check the site name, room code and unit code.`,
        );
      }
    }
  }

  // Owner
  let ownerId: number | null = null;
  if (cell("owner_email") !== "") {
    const email = take("owner_email", readEmail(cell("owner_email")));
    if (email !== undefined) {
      const id = lookups.userIdByEmail(email);
      if (id === undefined) {
        report("owner_email", `No Headroom user has the e-mail address ${email}; invite them first or leave the cell empty.`);
      } else ownerId = id;
    }
  }

  // Dates
  const readOptionalDate = (column: string): number | null => {
    if (cell(column) === "") return null;
    return take(column, readDate(cell(column))) ?? null;
  };
  const receivedAt = readOptionalDate("received_on");
  const openedAt = readOptionalDate("opened_on");
  const expiresAt = readOptionalDate("expires_on");
  if (receivedAt !== null && openedAt !== null && openedAt < receivedAt) {
    report(
      "opened_on",
      `Opened on ${cell("opened_on")}, before it was received on ${cell("received_on")}; check both dates.`,
    );
  }

  const notes = cell("notes");
  if (notes.length > NOTES_MAX_LENGTH) {
    report("notes", `Notes are ${notes.length} characters long; the most is ${NOTES_MAX_LENGTH}.`);
  }

  if (
    !complete ||
    amount === undefined ||
    amountUnit === undefined ||
    containerKind === undefined ||
    state === undefined ||
    storageUnitId === undefined
  ) {
    return undefined;
  }
  return {
    line: row.line,
    label,
    substanceId,
    mixtureId,
    amount,
    amountUnit,
    capacity,
    capacityUnit,
    containerKind,
    state,
    storageUnitId,
    ownerId,
    receivedAt,
    openedAt,
    expiresAt,
    notes: notes === "" ? null : notes,
    defaulted: [
      ...(cell("container_kind") === "" ? (["containerKind"] as const) : []),
      ...(cell("state") === "" ? (["state"] as const) : []),
    ],
  };
}
