/** Applies pending migrations to DATABASE_PATH (default data/headroom.db). */
import { closeDb, databasePath, getDb } from "../db/client";

getDb();
closeDb();
console.log(`[headroom] database ${databasePath()} is up to date`);
