/** Invented library, locations and users for the import tests. */
import { CONTAINER_COLUMNS, type ContainerLookups, type ParsedTable } from "@/lib/imports";

const SUBSTANCES = [
  { id: 1, cas: "64-17-5", names: ["Ethanol", "Ethyl alcohol"] },
  { id: 2, cas: "67-64-1", names: ["Acetone", "Propan-2-one"] },
  { id: 3, cas: "7732-18-5", names: ["Water"] },
  { id: 4, cas: "60-29-7", names: ["Diethyl ether", "Ether"] },
];
const MIXTURES = [{ id: 10, name: "Solvent waste (halogen-free)" }];
const UNITS = [
  { id: 100, site: "North Campus", room: "B-014", unit: "FC-1" },
  { id: 101, site: "North Campus", room: "B-014", unit: "FR-2" },
  { id: 102, site: "South Campus", room: "L-2", unit: "SH-1" },
];
const USERS = [{ id: 7, email: "r.okafor@example.org" }];

const same = (a: string, b: string) => a.toLowerCase() === b.toLowerCase();

/** Lookups that know only the storage unit as a whole, as the brief's minimum. */
export const basicLookups: ContainerLookups = {
  substanceIdByCas: (cas) => SUBSTANCES.find((s) => s.cas === cas)?.id,
  substanceIdByName: (name) => SUBSTANCES.find((s) => s.names.some((n) => same(n, name)))?.id,
  mixtureIdByName: (name) => MIXTURES.find((m) => same(m.name, name))?.id,
  storageUnitId: (site, room, unit) =>
    UNITS.find((u) => same(u.site, site) && u.room === room && u.unit === unit)?.id,
  userIdByEmail: (email) => USERS.find((u) => u.email === email)?.id,
};

/** Lookups that can also tell an unknown site or room apart from an unknown unit. */
export const lookups: ContainerLookups = {
  ...basicLookups,
  siteIdByName: (name) => (UNITS.some((u) => same(u.site, name)) ? 1 : undefined),
  roomIdByCode: (site, room) => (UNITS.some((u) => same(u.site, site) && u.room === room) ? 1 : undefined),
};

export const VALID_CONTAINER: Record<string, string> = {
  label: "HR-000001",
  cas: "64-17-5",
  amount: "2.5",
  amount_unit: "L",
  capacity: "4",
  capacity_unit: "L",
  container_kind: "glass_bottle",
  state: "sealed",
  site: "North Campus",
  room: "B-014",
  storage_unit: "FC-1",
  owner_email: "r.okafor@example.org",
  received_on: "2026-01-12",
  opened_on: "2026-02-01",
  expires_on: "2028-01-31",
  notes: "",
};

/**
 * A table with every container column, one row per entry (a valid container changed by the
 * entry), on lines 2, 3, … as after a header on line 1.
 */
export function containerTable(changes: Record<string, string>[]): ParsedTable {
  const headers = CONTAINER_COLUMNS.map((c) => c.name);
  return {
    format: "csv",
    headers,
    rows: changes.map((change, i) => ({
      line: i + 2,
      cells: Object.fromEntries(
        headers.map((h) => [h, change[h] ?? (h === "label" ? `HR-${String(i + 1).padStart(6, "0")}` : VALID_CONTAINER[h])]),
      ),
    })),
  };
}

export const encode = (text: string) => new TextEncoder().encode(text);
