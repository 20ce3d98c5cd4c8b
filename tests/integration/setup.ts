/**
 * Integration tests run against a real SQLite file, made fresh for each test file.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll } from "vitest";

const dir = fs.mkdtempSync(path.join(os.tmpdir(), "headroom-test-"));
process.env.DATABASE_PATH = path.join(dir, "headroom.db");
process.env.BCRYPT_COST = "4";
process.env.SESSION_SECRET = "integration-tests-session-secret-0123456789";
process.env.APP_URL = "http://localhost:3999";
process.env.LOG_LEVEL = process.env.TEST_LOG_LEVEL || "silent";

afterAll(async () => {
  const { closeDb } = await import("@/db/client");
  closeDb();
  fs.rmSync(dir, { recursive: true, force: true });
});
