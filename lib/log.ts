import "server-only";
import pino from "pino";

const globalForLog = globalThis as unknown as { __headroomLog?: pino.Logger };

/** One JSON line per request outcome and per job run. Secrets are redacted by path. */
export const log: pino.Logger =
  globalForLog.__headroomLog ??
  (globalForLog.__headroomLog = pino({
    level: process.env.LOG_LEVEL || (process.env.VITEST ? "silent" : "info"),
    base: { app: "headroom" },
    redact: {
      paths: [
        "password",
        "*.password",
        "token",
        "*.token",
        "apiKey",
        "*.apiKey",
        "cookie",
        "*.cookie",
        "authorization",
        "*.authorization",
        "headers.cookie",
        "headers.authorization",
        "secret",
        "*.secret",
      ],
      censor: "[redacted]",
    },
  }));
