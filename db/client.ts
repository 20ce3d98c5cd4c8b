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
