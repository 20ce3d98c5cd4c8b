import { defineConfig } from "@playwright/test";

const PORT = Number(process.env.E2E_PORT || 3100);
const EMAIL_FAKE_PORT = Number(process.env.E2E_EMAIL_FAKE_PORT || 3125);
// Single sign-on: the local OpenID Connect provider started by the demo.
const OIDC_FAKE_PORT = Number(process.env.E2E_OIDC_FAKE_PORT || 3126);
const WEBHOOK_FAKE_PORT = Number(process.env.E2E_WEBHOOK_FAKE_PORT || 3127);
export const BASE_URL = `http://localhost:${PORT}`;
export const EMAIL_FAKE_URL = `http://127.0.0.1:${EMAIL_FAKE_PORT}`;
export const OIDC_FAKE_URL = `http://127.0.0.1:${OIDC_FAKE_PORT}`;

export default defineConfig({
  testDir: "tests/e2e",
  fullyParallel: false,
  workers: 1,
  retries: process.env.CI ? 1 : 0,
  timeout: 60_000,
  expect: { timeout: 10_000 },
  reporter: process.env.CI ? [["list"]] : [["list"], ["html", { open: "never" }]],
  use: {
    baseURL: BASE_URL,
    trace: "retain-on-failure",
    screenshot: "only-on-failure",
    launchOptions: {
      executablePath: "/usr/bin/chromium",
      args: [
        "--no-sandbox",
        "--disable-gpu",
        "--disable-dev-shm-usage",
        "--disable-background-networking",
        "--disable-component-update",
        "--disable-sync",
        "--no-first-run",
        "--disable-quic",
      ],
    },
  },
  webServer: {
    // A fresh demo database, a production build, the server and the e-mail fake beside it.
    command: "npm run demo -- --fresh",
    url: `${BASE_URL}/api/health`,
    timeout: 600_000,
    reuseExistingServer: !process.env.CI,
    stdout: "pipe",
    env: {
      PORT: String(PORT),
      EMAIL_FAKE_PORT: String(EMAIL_FAKE_PORT),
      OIDC_FAKE_PORT: String(OIDC_FAKE_PORT),
      WEBHOOK_FAKE_PORT: String(WEBHOOK_FAKE_PORT),
      DATABASE_PATH: process.env.E2E_DATABASE_PATH || "data/e2e/headroom.db",
      APP_URL: BASE_URL,
      NEXT_TELEMETRY_DISABLED: "1",
      LOG_LEVEL: "warn",
    },
  },
});
