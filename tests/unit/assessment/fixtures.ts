/**
 * Test snapshots: substances from the sourced substance library, and invented rooms, units and
 * containers (no real location).
 */
import type { AmountUnit, ContainerState, StorageUnitKind } from "@/db/enums";
import { substanceLibrary } from "@/db/seed/substance-library";
import { buildSubstanceSnapshot, type SubstanceFields } from "@/lib/assessment/rules";
import type { LocationSnapshot, RoomInfo, StoredContent, StoredLiquid, SubstanceSnapshot, UnitInfo } from "@/lib/assessment/rules";
import { selectWorstCase, type WorstCase } from "@/lib/temperatures/worst-case";

export const CAS = {
  acetone: "67-64-1",
  benzene: "71-43-2",
  toluene: "108-88-3",
  diethylEther: "60-29-7",
  nButanol: "71-36-3",
  water: "7732-18-5",
  nitrogen: "7727-37-9",
  carbonDioxide: "124-38-9",
  ethanol: "64-17-5",
  dichloromethane: "75-09-2",
  nHexane: "110-54-3",
} as const;

/** The library entry as stored fields (ids are the entry's position + 1, as the seed inserts them). */
export function seedFields(cas: string): SubstanceFields {
  const index = substanceLibrary.findIndex((entry) => entry.cas === cas);
  if (index < 0) throw new Error(`No seeded substance with CAS ${cas}`);
  const seed = substanceLibrary[index];
  return {
    id: index + 1,
    name: seed.name,
    cas: seed.cas,
    physicalState: seed.physicalState,
    molarMassGPerMol: seed.molarMassGPerMol,
    correlations: seed.correlations,
    normalBoilingPointC: seed.normalBoilingPointC,
    enthalpyOfVaporizationKJPerMol: seed.enthalpyOfVaporizationKJPerMol ?? null,
    meltingPointC: seed.meltingPointC ?? null,
    flashPointC: seed.flashPointC ?? null,
    lflVolPercent: seed.lflVolPercent ?? null,
    uflVolPercent: seed.uflVolPercent ?? null,
    liquidDensityKgPerM3: seed.liquidDensityKgPerM3 ?? (seed.liquidDensityGPerMl != null ? seed.liquidDensityGPerMl * 1000 : null),
    exposureLimits: seed.exposureLimits.map((limit) => ({ kind: limit.kind, value: limit.value, unit: limit.unit, body: limit.body, source: limit.source })),
    sources: seed.sources,
  };
}

const cache = new Map<string, SubstanceSnapshot>();

/** A substance with some stored fields changed (a new snapshot object, as an edit would give). */
export function substanceWith(cas: string, changes: Partial<SubstanceFields>): SubstanceSnapshot {
  return buildSubstanceSnapshot({ ...seedFields(cas), ...changes });
}

/** One shared snapshot per CAS number, as the assessment service builds them. */
export function substance(cas: string): SubstanceSnapshot {
  let found = cache.get(cas);
  if (!found) {
    found = buildSubstanceSnapshot(seedFields(cas));
    cache.set(cas, found);
  }
  return found;
}

export function designWorstCase(tempC: number, label = "design maximum"): WorstCase {
  return selectWorstCase([{ kind: "design", tempC, label }]) as WorstCase;
}

export function room(overrides: Partial<RoomInfo> = {}): RoomInfo {
  return {
    id: 7,
    siteId: 1,
    code: "2.115",
    name: "Synthesis lab",
    kind: "laboratory",
    volumeM3: 100,
    floorAreaM2: 40,
    airChangesPerHour: 6,
    mixingFactor: 0.5,
    sprinklered: false,
    atmosphericPressureKPa: 101.325,
    worstCase: designWorstCase(25),
    ...overrides,
  };
}

export function unit(overrides: Partial<UnitInfo> = {}): UnitInfo {
  return {
    id: 12,
    code: "FSR-1",
    name: "Flammable-storage refrigerator",
    kind: "flammable_storage_refrigerator" as StorageUnitKind,
    internalVolumeL: 280,
    ventilated: false,
    ignitionSourceFree: true,
    setRange: { minC: 2, maxC: 8 },
    worstCase: { inControl: designWorstCase(8, "upper end of the set range"), controlLost: null },
    ...overrides,
  };
}

let nextContainerId = 1000;

export function container(
  content: SubstanceSnapshot | StoredContent,
  amount: number,
  amountUnit: AmountUnit = "L",
  state: ContainerState = "sealed",
  overrides: Partial<StoredLiquid> = {},
): StoredLiquid {
  const containerId = overrides.containerId ?? nextContainerId++;
  return {
    containerId,
    label: `C-${containerId}`,
    content: "props" in content ? { kind: "substance", substance: content } : content,
    amount,
    amountUnit,
    state,
    ...overrides,
  };
}

export function unitSnapshot(contents: StoredLiquid[], unitOverrides: Partial<UnitInfo> = {}, roomOverrides: Partial<RoomInfo> = {}): LocationSnapshot {
  return { kind: "unit", unit: unit(unitOverrides), room: room(roomOverrides), contents };
}

export function roomSnapshot(contents: StoredLiquid[], roomOverrides: Partial<RoomInfo> = {}): LocationSnapshot {
  return { kind: "room", room: room(roomOverrides), contents };
}

export function relativeDeviation(actual: number, expected: number): number {
  return Math.abs(actual / expected - 1);
}
