/**
 * The query plans of the statements a piece of code runs: each statement prepared on the
 * connection while `run` executes is recorded with the parameters it was executed with, then
 * explained with `EXPLAIN QUERY PLAN` (the parameters matter: SQLite's planner may use them).
 */
import type Database from "better-sqlite3";

export type ExplainedStatement = { sql: string; plan: string[] };

type PlanRow = { id: number; parent: number; detail: string };

export function explainStatements(sqlite: Database.Database, run: () => void): ExplainedStatement[] {
  const executed: { sql: string; params: unknown[] }[] = [];
  const prepare = sqlite.prepare;
  sqlite.prepare = ((source: string) => {
    const statement = prepare.call(sqlite, source);
    for (const method of ["all", "get", "run", "iterate"] as const) {
      const original = statement[method] as (...params: unknown[]) => unknown;
      Object.defineProperty(statement, method, {
        value: (...params: unknown[]) => {
          executed.push({ sql: source, params });
          return original.apply(statement, params);
        },
      });
    }
    return statement;
  }) as typeof sqlite.prepare;
  try {
    run();
  } finally {
    sqlite.prepare = prepare;
  }
  return executed.map(({ sql, params }) => {
    const explain = prepare.call(sqlite, `EXPLAIN QUERY PLAN ${sql}`) as Database.Statement<unknown[], PlanRow>;
    const rows = explain.all(...params);
    return { sql, plan: planLines(rows) };
  });
}

/** The plan as an indented tree, as the sqlite3 shell prints it. */
function planLines(rows: PlanRow[]): string[] {
  const depth = new Map<number, number>([[0, -1]]);
  return rows.map((row) => {
    const level = (depth.get(row.parent) ?? -1) + 1;
    depth.set(row.id, level);
    return `${"  ".repeat(level)}${row.detail}`;
  });
}
