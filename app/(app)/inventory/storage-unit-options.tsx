/** A storage unit as the container form and the move dialog offer it. */
export type StorageUnitChoice = { id: number; code: string; name: string; roomCode: string; roomName: string; siteName: string };

/** The units grouped by site and room, in the order given: "North Campus · B-014 Solvent store". */
export function groupStorageUnits(units: readonly StorageUnitChoice[]): [string, StorageUnitChoice[]][] {
  const groups = new Map<string, StorageUnitChoice[]>();
  for (const unit of units) {
    const key = `${unit.siteName} · ${unit.roomCode} ${unit.roomName}`;
    groups.set(key, [...(groups.get(key) ?? []), unit]);
  }
  return [...groups.entries()];
}

/** The `<optgroup>`s of a storage-unit select, one per room; each option reads "FC-1 Flammables cabinet". */
export function StorageUnitOptions({ units }: { units: readonly StorageUnitChoice[] }) {
  return groupStorageUnits(units).map(([group, list]) => (
    <optgroup key={group} label={group}>
      {list.map((unit) => (
        <option key={unit.id} value={unit.id}>
          {unit.code} {unit.name}
        </option>
      ))}
    </optgroup>
  ));
}
