/**
 * Open findings of one place (a container, a storage unit, a room): which of them a person may read
 * in the register, the rest only counted, worst first. Pure, so client components may import it.
 */
import type { Severity } from "@/db/enums";

export const SEVERITY_RANK: Record<Severity, number> = { critical: 4, high: 3, moderate: 2, low: 1 };

/** A finding as the "Open findings here" panel shows it. */
export type OpenFindingItem = {
  id: number;
  severity: Severity;
  status: string;
  title: string;
  scenario: string;
  value: number | null;
  limit: number | null;
  ratio: number | null;
  unit: string | null;
  roomId: number | null;
  storageUnitId: number | null;
  unitCode: string | null;
};

/** What the queries return per finding: the item and whether the reader's scope covers it. */
export type OpenFindingRow = OpenFindingItem & { visible: boolean };

export type OpenFindingsHere = {
  /** Findings the reader may open, worst first. */
  items: OpenFindingItem[];
  /** Open findings here outside the reader's scope of the register: how many, and the worst. */
  hidden: { count: number; worst: Severity | null };
  /** The reader's scope of the register: "own" lists only their containers' and locations' findings. */
  scope: "all" | "own";
};

/** The worst of some severities, or null for none. */
export function worstSeverity(severities: Iterable<Severity>): Severity | null {
  let worst: Severity | null = null;
  for (const severity of severities) if (worst === null || SEVERITY_RANK[severity] > SEVERITY_RANK[worst]) worst = severity;
  return worst;
}

/** Worst first: severity, then the ratio to the limit (none last), then the oldest finding. */
export function compareWorstFirst(a: OpenFindingItem, b: OpenFindingItem): number {
  const bySeverity = SEVERITY_RANK[b.severity] - SEVERITY_RANK[a.severity];
  if (bySeverity !== 0) return bySeverity;
  const ratioA = a.ratio ?? -Infinity;
  const ratioB = b.ratio ?? -Infinity;
  if (ratioA !== ratioB) return ratioB > ratioA ? 1 : -1;
  return a.id - b.id;
}

/** Splits rows into what the reader may open (sorted worst first) and a count of the rest. */
export function splitByScope(rows: readonly OpenFindingRow[], scope: "all" | "own"): OpenFindingsHere {
  const items: OpenFindingItem[] = [];
  const hiddenSeverities: Severity[] = [];
  for (const { visible, ...item } of rows) {
    if (visible) items.push(item);
    else hiddenSeverities.push(item.severity);
  }
  items.sort(compareWorstFirst);
  return { items, hidden: { count: hiddenSeverities.length, worst: worstSeverity(hiddenSeverities) }, scope };
}

/**
 * A room's findings by where they sit (the room as a whole, each unit), worst first: the groups
 * in the order of their worst finding, the room's own first on a tie. Items keep their order.
 */
export function groupByUnit(items: readonly OpenFindingItem[]): { storageUnitId: number | null; unitCode: string | null; items: OpenFindingItem[] }[] {
  const groups = new Map<number | null, { storageUnitId: number | null; unitCode: string | null; items: OpenFindingItem[] }>();
  for (const item of items) {
    const group = groups.get(item.storageUnitId) ?? { storageUnitId: item.storageUnitId, unitCode: item.unitCode, items: [] };
    group.items.push(item);
    groups.set(item.storageUnitId, group);
  }
  return [...groups.values()].sort((a, b) => {
    const byWorst = SEVERITY_RANK[b.items[0].severity] - SEVERITY_RANK[a.items[0].severity];
    if (byWorst !== 0) return byWorst;
    if (a.storageUnitId === null) return -1;
    if (b.storageUnitId === null) return 1;
    return (a.unitCode ?? "").localeCompare(b.unitCode ?? "", "en", { numeric: true });
  });
}

/** The ratio to the limit as a percentage ("85 %"), "∞ %" when nothing is left of a lower limit, null without one. */
export function ratioPercent(ratio: number | null, format: (value: number) => string): string | null {
  if (ratio == null || Number.isNaN(ratio)) return null;
  if (ratio === Infinity) return "∞ %";
  return `${format(ratio * 100)} %`;
}

export type FindingPlace = { kind: "room"; roomId: number } | { kind: "unit"; storageUnitId: number } | { kind: "container"; containerId: number };

/** The register filtered to a place. */
export function registerHrefFor(place: FindingPlace): string {
  if (place.kind === "room") return `/register?roomId=${place.roomId}`;
  if (place.kind === "unit") return `/register?storageUnitId=${place.storageUnitId}`;
  return `/register?containerId=${place.containerId}`;
}
