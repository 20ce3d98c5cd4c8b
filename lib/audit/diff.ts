/** The fields that differ between two snapshots, as the before/after pair an audit event stores. */
export function changedFields<T extends Record<string, unknown>>(
  before: T,
  after: T,
  ignore: readonly string[] = ["updatedAt", "createdAt"],
): { before: Partial<T>; after: Partial<T>; keys: string[] } {
  const keys = Object.keys(after).filter(
    (key) => !ignore.includes(key) && JSON.stringify(before[key] ?? null) !== JSON.stringify(after[key] ?? null),
  );
  const pick = (source: T) => Object.fromEntries(keys.map((k) => [k, source[k] ?? null])) as Partial<T>;
  return { before: pick(before), after: pick(after), keys };
}

/** A snapshot fit for the audit log: dates as ISO strings, nothing else changed. */
export function auditSnapshot<T extends Record<string, unknown>>(row: T): Record<string, unknown> {
  return Object.fromEntries(Object.entries(row).map(([k, v]) => [k, v instanceof Date ? v.toISOString() : v]));
}
