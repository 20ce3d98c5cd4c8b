import { ConflictError } from "@/lib/errors";

/**
 * Turns a SQLite constraint failure into a 409 with a field error; anything else is rethrown.
 * `unique` maps an index name to the field and message to show.
 */
export function rethrowConstraint(error: unknown, unique: Record<string, { field: string; message: string }>): never {
  const code = (error as { code?: string } | null)?.code;
  const text = error instanceof Error ? error.message : String(error);
  if (code === "SQLITE_CONSTRAINT_UNIQUE" || code === "SQLITE_CONSTRAINT_PRIMARYKEY") {
    for (const [, hit] of Object.entries(unique).filter(([index]) => text.includes(index) || matchesColumns(text, index))) {
      throw new ConflictError(hit.message, { [hit.field]: [hit.message] });
    }
    const first = Object.values(unique)[0];
    if (first) throw new ConflictError(first.message, { [first.field]: [first.message] });
  }
  if (code === "SQLITE_CONSTRAINT_FOREIGNKEY") {
    throw new ConflictError("This is still referred to by other records, so it cannot be removed.");
  }
  throw error;
}

// SQLite names the columns ("UNIQUE constraint failed: rooms.site_id, rooms.code"), not the index.
function matchesColumns(message: string, key: string): boolean {
  return key.includes(".") && message.includes(key);
}
