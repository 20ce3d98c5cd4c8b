/**
 * The register's selection of findings, as pure functions: one finding, a line's findings, a
 * location's or a page's are ticked and unticked together, and a box shows whether all, some or
 * none of its findings are selected.
 */

export type SelectionMark = "all" | "some" | "none";

/** The selection after ticking (on) or unticking the given findings; the others stay as they were. */
export function toggleFindings(selected: ReadonlySet<number>, ids: readonly number[], on: boolean): ReadonlySet<number> {
  const next = new Set(selected);
  for (const id of ids) {
    if (on) next.add(id);
    else next.delete(id);
  }
  return next;
}

/** How a box over these findings shows: ticked when all are selected, mixed when some are. */
export function selectionMark(selected: ReadonlySet<number>, ids: readonly number[]): SelectionMark {
  if (ids.length === 0) return "none";
  const count = ids.reduce((n, id) => (selected.has(id) ? n + 1 : n), 0);
  return count === 0 ? "none" : count === ids.length ? "all" : "some";
}

/** The ids the step is sent for: each once, in ascending order. */
export function selectedIds(selected: ReadonlySet<number>): number[] {
  return [...selected].sort((a, b) => a - b);
}
