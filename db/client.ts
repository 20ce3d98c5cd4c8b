import "server-only";
import fs from "node:fs";
import path from "node:path";
import Database from "better-sqlite3";
import { drizzle, type BetterSQLite3Database } from "drizzle-orm/better-sqlite3";
import { migrate } from "drizzle-orm/better-sqlite3/migrator";
import * as schema from "./schema";

export type Db = BetterSQLite3Database<typeof schema> & { $client: Database.Database };

type Cached = { path: string; db: Db };
const globalForDb = globalThis as unknown as { __headroomDb?: Cached };

export function databasePath(): string {
  return process.env.DATABASE_PATH || path.join("data", "headroom.db");
}

/** Opens the database file, applying the pragmas and any pending migrations. */
export function openDatabase(filePath: string): Db {
  if (filePath !== ":memory:") fs.mkdirSync(path.dirname(path.resolve(filePath)), { recursive: true });
  const sqlite = new Database(filePath);
  sqlite.pragma("journal_mode = WAL");
  sqlite.pragma("synchronous = NORMAL");
  sqlite.pragma("foreign_keys = ON");
  sqlite.pragma("busy_timeout = 5000");
  const db = drizzle(sqlite, { schema }) as Db;
  migrate(db, { migrationsFolder: path.join(process.cwd(), "drizzle") });
  return db;
}

/** The one connection of this process (cached on globalThis so dev reloads reuse it). */
export function getDb(): Db {
  const filePath = databasePath();
  const cached = globalForDb.__headroomDb;
  if (cached && cached.path === filePath) return cached.db;
  if (cached) cached.db.$client.close();
  const db = openDatabase(filePath);
  globalForDb.__headroomDb = { path: filePath, db };
  return db;
}

/** Closes the cached connection (tests and scripts). */
export function closeDb(): void {
  globalForDb.__headroomDb?.db.$client.close();
  globalForDb.__headroomDb = undefined;
}

export type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];
export type DbOrTx = Db | Tx;

/** The better-sqlite3 connection under a Drizzle database or transaction (one connection per process). */
export function sqliteOf(db: DbOrTx): Database.Database {
  return (db as unknown as { session: { client: Database.Database } }).session.client;
}

const statementCache = new WeakMap<Database.Database, Map<string, Database.Statement>>();

/**
 * A prepared statement on the connection under `db`, prepared once per connection. For the few
 * hot paths (re-assessment, exports) where the query builder's row mapping costs as much as SQLite.
 * Pass lists as JSON text and read them with `json_each(?)`.
 */
export function preparedOn(db: DbOrTx, source: string): Database.Statement {
  const sqlite = sqliteOf(db);
  let cache = statementCache.get(sqlite);
  if (!cache) statementCache.set(sqlite, (cache = new Map()));
  let statement = cache.get(source);
  if (!statement) cache.set(source, (statement = sqlite.prepare(source)));
  return statement;
}
